import type { Generated, Insertable, Selectable, Updateable } from "kysely";

// The database as the app sees it. Dates are ISO-8601 UTC text; booleans are 0/1 integers;
// JSON columns are text parsed at the data-access boundary.

export type OrganisationKind = "unit" | "customer";

export interface OrganisationsTable {
  id: Generated<number>;
  kind: OrganisationKind;
  name: string;
  short_code: string;
  billing_email: string | null;
  active: Generated<number>;
  /** VAT identifier with its country prefix, for e-invoices (migration 0032). */
  vat_id: string | null;
  /** ISO 3166-1 alpha-2 country of the organisation's addresses (migration 0032). */
  country_code: Generated<string>;
  created_at: string;
  updated_at: string;
}

export interface SitesTable {
  id: Generated<number>;
  organisation_id: number;
  name: string;
  address_line1: string;
  address_line2: string | null;
  town: string;
  postcode: string;
  latitude: number;
  longitude: number;
  opening_hours: string;
  delivery_notes: string | null;
  contact_name: string | null;
  contact_phone: string | null;
  contact_email: string | null;
  is_depot: Generated<number>;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
  /** How the site stores sterile goods, for the shelf-life rule at release (migration 0040). */
  sterile_storage: Generated<SterileStorage>;
}

export type UserStatus = "invited" | "active" | "disabled";

export interface UsersTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number | null;
  email: string;
  name: string;
  role: string;
  password_hash: string | null;
  status: UserStatus;
  session_version: Generated<number>;
  mail_preferences: Generated<string>;
  last_sign_in_at: string | null;
  created_at: string;
  updated_at: string;
}

export interface InvitationsTable {
  id: Generated<number>;
  user_id: number;
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
  created_by: number | null;
  created_at: string;
}

export interface SignInFailuresTable {
  id: Generated<number>;
  email: string;
  at: string;
}

export interface AuditLogTable {
  id: Generated<number>;
  at: string;
  actor_user_id: number | null;
  organisation_id: number | null;
  action: string;
  entity: string;
  entity_id: string | null;
  details: Generated<string>;
}

export type OutboxStatus = "pending" | "sending" | "sent";

export interface OutboxTable {
  id: Generated<number>;
  template: string;
  organisation_id: number | null;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  message_id: string;
  dedupe_key: string | null;
  status: OutboxStatus;
  attempts: Generated<number>;
  next_attempt_at: string;
  locked_until: string | null;
  last_error: string | null;
  created_at: string;
  sent_at: string | null;
}

export interface FilesTable {
  id: Generated<number>;
  organisation_id: number | null;
  purpose: string;
  original_name: string;
  content_type: string;
  size_bytes: number;
  sha256: string;
  storage_key: string;
  uploaded_by: number | null;
  created_at: string;
}

export type Packaging = "wrap" | "rigid_container" | "single_pouch" | "double_pouch";
export type SterilisationMethod = "steam_134" | "steam_121" | "low_temperature";

export interface SetTypesTable {
  id: Generated<number>;
  organisation_id: number;
  code: string;
  name: string;
  set_class: string;
  packaging: Packaging;
  sterilisation_method: SterilisationMethod;
  processing_flags: Generated<string>;
  processing_notes: string | null;
  weight_g: number;
  size_stu: number;
  /** 1 when the set holds implants: its loads wait for the biological indicator (migration 0040). */
  contains_implant: Generated<number>;
  ifu_file_id: number | null;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
}

export interface SetTypeItemsTable {
  id: Generated<number>;
  set_type_id: number;
  position: number;
  name: string;
  quantity: number;
}

export interface SetsTable {
  id: Generated<number>;
  organisation_id: number;
  set_type_id: number;
  home_site_id: number;
  serial: string;
  giai: string;
  status: "in_service" | "retired";
  notes: string | null;
  created_at: string;
  updated_at: string;
}

export interface ContractsTable {
  id: Generated<number>;
  organisation_id: number;
  reference: string;
  valid_from: string;
  valid_until: string | null;
  currency: string;
  vat_category: Generated<string>;
  vat_rate_bp: number;
  payment_terms_days: number;
  turnaround_standard_hours: number;
  turnaround_express_hours: number;
  clock_stops_at: "released" | "delivered";
  service_calendar: string;
  minimum_monthly_fee_minor: number;
  sla_credit_bp: number;
  notes: string | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

export interface ContractRatesTable {
  id: Generated<number>;
  contract_id: number;
  set_class: string;
  band_index: number;
  up_to_quantity: number | null;
  unit_price_minor: number;
}

export interface ContractSurchargesTable {
  id: Generated<number>;
  contract_id: number;
  kind: string;
  basis: "per_set" | "percent_of_fee";
  amount_minor: number | null;
  basis_points: number | null;
}

export type OrderKind = "pickup" | "store_request";
export type OrderStatus = "booked" | "collected" | "in_process" | "ready" | "out_for_delivery" | "delivered" | "cancelled";

export interface OrdersTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number;
  reference: string;
  kind: OrderKind;
  status: OrderStatus;
  service_level: "standard" | "express";
  collection_from: string | null;
  collection_until: string | null;
  needed_back_by: string | null;
  promised_return_at: string | null;
  heavy_soil: Generated<number>;
  out_of_hours: Generated<number>;
  notes: string | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
  collected_at: string | null;
  cancelled_at: string | null;
}

export interface OrderExtrasTable {
  id: Generated<number>;
  order_id: number;
  description: string;
  quantity: number;
}

export interface CyclesTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number;
  set_id: number;
  order_id: number | null;
  keep_in_store: Generated<number>;
  return_order_id: number | null;
  state: string;
  held_from: string | null;
  hold_reason: string | null;
  service_level: "standard" | "express";
  heavy_soil: Generated<number>;
  out_of_hours: Generated<number>;
  loaner: Generated<number>;
  missing_instrument: Generated<number>;
  needed_back_by: string | null;
  promised_at: string | null;
  booked_at: string;
  collected_at: string | null;
  received_at: string | null;
  washed_at: string | null;
  packed_at: string | null;
  sterilised_at: string | null;
  released_at: string | null;
  dispatched_at: string | null;
  delivered_at: string | null;
  cancelled_at: string | null;
  expires_on: string | null;
  created_at: string;
  updated_at: string;
}

export interface ScanEventsTable {
  id: Generated<number>;
  cycle_id: number;
  set_id: number;
  organisation_id: number;
  event: string;
  from_state: string | null;
  to_state: string;
  station: string;
  batch_id: number | null;
  load_id: number | null;
  user_id: number | null;
  at: string;
  client_event_id: string | null;
  details: Generated<string>;
}

export type ProblemKind = "missing_instrument" | "damaged_instrument" | "wet_or_torn_pack" | "wrong_set" | "other";

export interface ProblemsTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number;
  order_id: number | null;
  cycle_id: number | null;
  set_id: number | null;
  kind: ProblemKind;
  description: string;
  photo_file_id: number | null;
  status: "open" | "answered";
  answer: string | null;
  answered_by: number | null;
  answered_at: string | null;
  reported_by: number | null;
  created_at: string;
}

export interface ProcedureUsesTable {
  id: Generated<number>;
  organisation_id: number;
  site_id: number;
  cycle_id: number;
  set_id: number;
  theatre: string;
  case_reference: string;
  pack_checked: number;
  indicator_checked: number;
  recorded_by: number | null;
  used_at: string;
}

export interface JobRunsTable {
  name: string;
  last_period: string;
  last_scheduled_at: string;
  last_run_at: string;
  last_result: Generated<string>;
  runs: Generated<number>;
}

export type MachineKind = "washer" | "steriliser" | "heat_sealer" | "drying_cabinet" | "ultrasonic";

export interface MachinesTable {
  id: Generated<number>;
  kind: MachineKind;
  code: string;
  name: string;
  serial_number: string | null;
  capacity_stu: number | null;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
  chamber_width_mm: number | null;
  chamber_height_mm: number | null;
  chamber_depth_mm: number | null;
}

export type MachineLogKind = "washer_cleaning" | "service" | "fault" | "seal_test" | "water_reading" | "salt_refill" | "store_climate";

export interface MachineLogTable {
  id: Generated<number>;
  kind: MachineLogKind;
  machine_id: number | null;
  place: string | null;
  at: string;
  recorded_by: number;
  recorded_at: string;
  outcome: "pass" | "fail" | null;
  temperature_c: number | null;
  humidity_pct: number | null;
  conductivity_us_cm: number | null;
  hardness_mmol_l: number | null;
  salt_kg: number | null;
  provider: string | null;
  reference: string | null;
  notes: string | null;
  cleared_at: string | null;
  cleared_by: number | null;
  clearance_note: string | null;
  out_of_range: Generated<number>;
  findings: Generated<string>;
}

export interface MonitoringSettingsTable {
  key: string;
  value: string;
  updated_by: number | null;
  updated_at: string;
}

export interface ProgramsTable {
  id: Generated<number>;
  machine_id: number;
  code: string;
  name: string;
  requirement: string;
  active: Generated<number>;
}

export type WasherBatchStatus = "loading" | "running" | "passed" | "failed" | "aborted";

export interface WasherBatchesTable {
  id: Generated<number>;
  number: string;
  machine_id: number;
  program_id: number;
  status: WasherBatchStatus;
  started_by: number | null;
  started_at: string | null;
  ended_at: string | null;
  record_file_id: number | null;
  figures: string | null;
  reasons: string | null;
  closed_by: number | null;
  closed_at: string | null;
  created_at: string;
}

export interface WasherBatchItemsTable {
  batch_id: number;
  cycle_id: number;
  added_at: string;
}

export interface PackRecordsTable {
  id: Generated<number>;
  cycle_id: number;
  packed_by: number | null;
  packaging: string;
  counts: string;
  irregularities: Generated<string>;
  outcome: "packed" | "held";
  notes: string | null;
  at: string;
  /** Why the packaging differs from the set type's, when it does (migration 0023). */
  packaging_reason: string | null;
  /** The pouch sizes used, e.g. "135 × 260 mm inside 190 × 330 mm" (migration 0023). */
  pouch: string | null;
  /** The pack or hold scan event this record belongs to (migration 0023). */
  scan_event_id: number | null;
}

export type SterileStorage = "protected" | "unprotected";
export type MachineTestKind = "air_removal" | "leak";

/** A steriliser's daily test for one unit day (YYYY-MM-DD in the unit's zone), migration 0040. */
export interface MachineTestsTable {
  id: Generated<number>;
  machine_id: number;
  kind: MachineTestKind;
  unit_day: string;
  result: "pass" | "fail";
  leak_rate_kpa_min: number | null;
  leak_limit_kpa_min: number | null;
  notes: string | null;
  performed_by: number | null;
  performed_at: string;
  created_at: string;
}

export type LoadStatus = "loading" | "running" | "awaiting_release" | "released" | "failed" | "aborted";
export type BiResult = "pending" | "pass" | "fail" | "not_used";

/** One run of a steriliser; `figures` and `reasons` are JSON of the record check (migration 0040). */
export interface SteriliserLoadsTable {
  id: Generated<number>;
  number: string;
  machine_id: number;
  program_id: number;
  status: LoadStatus;
  contains_implant: Generated<number>;
  air_removal_test_id: number | null;
  created_by: number | null;
  created_at: string;
  started_by: number | null;
  started_at: string | null;
  ended_at: string | null;
  finished_by: number | null;
  record_file_id: number | null;
  figures: string | null;
  reasons: string | null;
  record_passed: number | null;
  ci_type: number | null;
  ci_result: "pass" | "fail" | null;
  bi_result: BiResult | null;
  bi_lot: string | null;
  bi_read_at: string | null;
  bi_read_by: number | null;
  early_release_reason: string | null;
  early_release_by: number | null;
  decision_by: number | null;
  decision_at: string | null;
  decision_notes: string | null;
  failed_after_release: Generated<number>;
}

export interface LoadItemsTable {
  load_id: number;
  cycle_id: number;
  shelf: Generated<"lower" | "any">;
  added_by: number | null;
  added_at: string;
}

export type ShelfLifeUnit = "hours" | "days" | "months" | "years";

export interface ShelfLifeRulesTable {
  id: Generated<number>;
  packaging: string;
  storage: SterileStorage;
  amount: number;
  unit: ShelfLifeUnit;
  updated_by: number | null;
  updated_at: string;
}

export interface SterileSettingsTable {
  key: string;
  value: string;
  updated_by: number | null;
  updated_at: string;
}

export interface RecallsTable {
  id: Generated<number>;
  number: string;
  load_id: number;
  reason: string;
  status: "open" | "closed";
  created_by: number | null;
  created_at: string;
  closed_at: string | null;
}

export interface RecallItemsTable {
  id: Generated<number>;
  recall_id: number;
  cycle_id: number;
  set_id: number;
  organisation_id: number;
  site_id: number;
  state_at_recall: string;
  returned_at: string | null;
  returned_by: number | null;
}

export interface PaymentCustomersTable {
  organisation_id: number;
  stripe_customer_id: string;
  created_at: string;
}

export interface InvoiceRunsTable {
  id: Generated<number>;
  period: string;
  period_start: string;
  period_end: string;
  status: "draft" | "approved" | "issuing" | "issued";
  created_by: number | null;
  approved_by: number | null;
  created_at: string;
  approved_at: string | null;
  issued_at: string | null;
}

export type InvoiceStatus = "draft" | "open" | "paid" | "void" | "uncollectible";

export interface InvoicesTable {
  id: Generated<number>;
  run_id: number | null;
  organisation_id: number;
  contract_id: number | null;
  number: string;
  currency: string;
  period_start: string;
  period_end: string;
  issue_date: string | null;
  due_date: string | null;
  status: InvoiceStatus;
  line_total_minor: number;
  tax_exclusive_minor: number;
  vat_minor: number;
  total_minor: number;
  amount_paid_minor: Generated<number>;
  amount_credited_minor: Generated<number>;
  amount_due_minor: number;
  vat_breakdown: string;
  stripe_invoice_id: string | null;
  stripe_number: string | null;
  hosted_invoice_url: string | null;
  last_payment_error: string | null;
  paid_at: string | null;
  created_at: string;
  updated_at: string;
}

export interface InvoiceLinesTable {
  id: Generated<number>;
  invoice_id: number;
  position: number;
  kind: string;
  item_code: string;
  description: string;
  note: string | null;
  quantity: number;
  unit_price_minor: number;
  net_minor: number;
  vat_category: string;
  vat_rate_bp: number;
  cycle_ids: Generated<string>;
  stripe_invoice_item_id: string | null;
}

export interface PricedCyclesTable {
  cycle_id: number;
  invoice_id: number;
  fee_minor: number;
  late: number;
  priced_at: string;
}

export interface PaymentsTable {
  id: Generated<number>;
  invoice_id: number;
  stripe_payment_id: string;
  amount_minor: number;
  currency: string;
  status: string;
  paid_at: string | null;
  created_at: string;
}

export interface WebhookEventsTable {
  id: string;
  type: string;
  received_at: string;
  processed_at: string | null;
}

export interface CreditNotesTable {
  id: Generated<number>;
  invoice_id: number;
  number: string;
  reason: string;
  net_minor: number;
  vat_minor: number;
  total_minor: number;
  lines: string;
  stripe_credit_note_id: string | null;
  /** How it was settled (migration 0032): reduced the amount due, refunded, or outside the payment service. */
  settlement: "amount_due" | "refund" | "out_of_band" | null;
  created_by: number | null;
  created_at: string;
}

export interface ReminderRulesTable {
  id: Generated<number>;
  days_after_due: number;
  created_at: string;
}

export type OrderNoticeKind = "unexpected_set" | "missing_set";

/** What the receiving station tells a clinic: a set that came unbooked, or a booked set that did not come. */
export interface OrderNoticesTable {
  id: Generated<number>;
  order_id: number | null;
  organisation_id: number;
  site_id: number;
  set_id: number;
  cycle_id: number;
  kind: OrderNoticeKind;
  message: string;
  created_at: string;
  created_by: number | null;
}

/** A van of the unit; carts ride in two segregated compartments (migration 0060). */
export interface VansTable {
  id: Generated<number>;
  code: string;
  name: string;
  registration: string;
  soiled_capacity_carts: number;
  clean_capacity_carts: number;
  active: Generated<number>;
  created_at: string;
  updated_at: string;
}

/** A driver's working day: minutes from local midnight of `day` (YYYY-MM-DD in the unit's zone). */
export interface DriverShiftsTable {
  id: Generated<number>;
  user_id: number;
  day: string;
  start_min: number;
  end_min: number;
  break_earliest_min: number | null;
  break_latest_min: number | null;
  break_duration_min: Generated<number>;
  van_id: number | null;
  created_at: string;
  updated_at: string;
}

export type RoutePlanStatus = "draft" | "published";

/** One day's plan of van runs; `summary` is JSON (totals, the planner's notes). */
export interface RoutePlansTable {
  id: Generated<number>;
  day: string;
  status: RoutePlanStatus;
  seed: number;
  road_factor: number;
  speed_kmh: number;
  created_by: number | null;
  created_at: string;
  solved_at: string | null;
  published_by: number | null;
  published_at: string | null;
  summary: Generated<string>;
}

/** One van's run in a plan: its driver and shift, and the planned figures. */
export interface RouteRunsTable {
  id: Generated<number>;
  plan_id: number;
  van_id: number;
  driver_user_id: number;
  shift_id: number;
  distance_km: Generated<number>;
  drive_min: Generated<number>;
  start_min: number | null;
  end_min: number | null;
}

export type RouteStopKind = "collection" | "delivery" | "both";
export type RouteStopStatus = "planned" | "served" | "not_served";

/** One visit to a customer site; run_id and position are null while unassigned. */
export interface RouteStopsTable {
  id: Generated<number>;
  plan_id: number;
  run_id: number | null;
  position: number | null;
  organisation_id: number;
  site_id: number;
  kind: RouteStopKind;
  window_start_min: number;
  window_end_min: number;
  hard: Generated<number>;
  service_min: number;
  soiled_carts: Generated<number>;
  clean_carts: Generated<number>;
  planned_arrival_min: number | null;
  planned_start_min: number | null;
  late_min: number | null;
  locked: Generated<number>;
  status: Generated<RouteStopStatus>;
  not_served_reason: string | null;
  signature_file_id: number | null;
  signed_by_name: string | null;
  served_at: string | null;
  served_by: number | null;
  expected_time_notified_at: string | null;
  /** The planned start last sent to the site by e-mail. */
  notified_start_min: number | null;
  /** Why the planner could not place the stop, or why it is late, in words. */
  note: string | null;
}

export interface RouteStopOrdersTable {
  stop_id: number;
  order_id: number;
  role: "collect" | "deliver";
}

/** A set scanned at a stop; client_event_id makes a retried scan a no-op. */
export interface StopScansTable {
  id: Generated<number>;
  client_event_id: string;
  stop_id: number;
  cycle_id: number;
  set_id: number;
  kind: "collect" | "deliver";
  scanned_by: number | null;
  scanned_at: string;
}

export interface Database {
  organisations: OrganisationsTable;
  sites: SitesTable;
  users: UsersTable;
  invitations: InvitationsTable;
  sign_in_failures: SignInFailuresTable;
  audit_log: AuditLogTable;
  outbox: OutboxTable;
  files: FilesTable;
  set_types: SetTypesTable;
  set_type_items: SetTypeItemsTable;
  sets: SetsTable;
  contracts: ContractsTable;
  contract_rates: ContractRatesTable;
  contract_surcharges: ContractSurchargesTable;
  orders: OrdersTable;
  order_extras: OrderExtrasTable;
  cycles: CyclesTable;
  scan_events: ScanEventsTable;
  problems: ProblemsTable;
  procedure_uses: ProcedureUsesTable;
  job_runs: JobRunsTable;
  machines: MachinesTable;
  machine_log: MachineLogTable;
  monitoring_settings: MonitoringSettingsTable;
  programs: ProgramsTable;
  washer_batches: WasherBatchesTable;
  washer_batch_items: WasherBatchItemsTable;
  pack_records: PackRecordsTable;
  machine_tests: MachineTestsTable;
  steriliser_loads: SteriliserLoadsTable;
  load_items: LoadItemsTable;
  shelf_life_rules: ShelfLifeRulesTable;
  sterile_settings: SterileSettingsTable;
  recalls: RecallsTable;
  recall_items: RecallItemsTable;
  payment_customers: PaymentCustomersTable;
  invoice_runs: InvoiceRunsTable;
  invoices: InvoicesTable;
  invoice_lines: InvoiceLinesTable;
  priced_cycles: PricedCyclesTable;
  payments: PaymentsTable;
  webhook_events: WebhookEventsTable;
  credit_notes: CreditNotesTable;
  reminder_rules: ReminderRulesTable;
  order_notices: OrderNoticesTable;
  vans: VansTable;
  driver_shifts: DriverShiftsTable;
  route_plans: RoutePlansTable;
  route_runs: RouteRunsTable;
  route_stops: RouteStopsTable;
  route_stop_orders: RouteStopOrdersTable;
  stop_scans: StopScansTable;
}

export type Organisation = Selectable<OrganisationsTable>;
export type Site = Selectable<SitesTable>;
export type NewSite = Insertable<SitesTable>;
export type User = Selectable<UsersTable>;
export type NewUser = Insertable<UsersTable>;
export type UserUpdate = Updateable<UsersTable>;
export type OutboxRow = Selectable<OutboxTable>;
export type FileRow = Selectable<FilesTable>;
export type SetType = Selectable<SetTypesTable>;
export type SetRow = Selectable<SetsTable>;
export type Contract = Selectable<ContractsTable>;
export type Order = Selectable<OrdersTable>;
export type CycleRow = Selectable<CyclesTable>;
export type ScanEvent = Selectable<ScanEventsTable>;
