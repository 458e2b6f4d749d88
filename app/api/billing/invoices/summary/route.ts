// GET /api/billing/invoices/summary — totals of the filtered invoices, open invoices by age, counts by status
import { listInvoicesQuerySchema, summariseInvoices } from "@/lib/billing/invoices";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("billing.view", async ({ req, db, user }) => summariseInvoices(db, user, parseQuery(req, listInvoicesQuerySchema)));
