import { type OpeningHours, weeklyHours } from "@/lib/sites/opening-hours";

// The invented region: the unit, its customers and their sites. Coordinates are placed on a map
// only so that van routes have distances; the places themselves do not exist.

export interface DemoSite {
  name: string;
  addressLine1: string;
  town: string;
  postcode: string;
  latitude: number;
  longitude: number;
  openingHours: OpeningHours;
  deliveryNotes?: string;
  contactName?: string;
  contactPhone?: string;
  isDepot?: boolean;
}

export interface DemoOrganisation {
  shortCode: string;
  name: string;
  kind: "unit" | "customer";
  billingEmail?: string;
  sites: DemoSite[];
}

const weekdays = ["mon", "tue", "wed", "thu", "fri"] as const;
const theatreHours: OpeningHours = {
  ...weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat", "sun"], "00:00", "24:00"),
};
const dentalHours: OpeningHours = {
  ...weeklyHours(weekdays, "08:30", "17:30"),
  wed: [
    { start: "08:30", end: "12:30" },
    { start: "13:30", end: "19:00" },
  ],
};

export const DEMO_ORGANISATIONS: DemoOrganisation[] = [
  {
    shortCode: "LSS",
    name: "Larkmoor Sterile Services",
    kind: "unit",
    sites: [
      {
        name: "Larkmoor reprocessing unit",
        addressLine1: "Unit 7, Hobbin Lane Trading Estate",
        town: "Larkmoor",
        postcode: "LK4 2RS",
        latitude: 53.7012,
        longitude: -1.5023,
        openingHours: weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat"], "06:00", "22:00"),
        deliveryNotes: "Soiled returns to dock A (north side), clean goods leave from dock C.",
        contactName: "Tobias Wrenfield",
        contactPhone: "01632 960 410",
        isDepot: true,
      },
    ],
  },
  {
    shortCode: "QMH",
    name: "Quillby Moor Hospitals",
    kind: "customer",
    billingEmail: "accounts@quillby.example",
    sites: [
      {
        name: "Quillby Moor General – Main Theatres",
        addressLine1: "Farrowdale Road, Theatre Block B",
        town: "Quillby Moor",
        postcode: "LK9 3QT",
        latitude: 53.7421,
        longitude: -1.4112,
        openingHours: theatreHours,
        deliveryNotes: "Goods lift behind the mortuary road; ring the theatre store on arrival.",
        contactName: "Owen Tilsley",
        contactPhone: "01632 960 511",
      },
      {
        name: "Quillby Moor General – Day Case Unit",
        addressLine1: "Farrowdale Road, Day Case entrance",
        town: "Quillby Moor",
        postcode: "LK9 3QU",
        latitude: 53.7433,
        longitude: -1.4075,
        openingHours: weeklyHours(weekdays, "07:00", "20:00"),
        contactName: "Lena Aptorp",
        contactPhone: "01632 960 512",
      },
      {
        name: "Quillby Moor Eye Centre",
        addressLine1: "14 Carden Walk",
        town: "Quillby Moor",
        postcode: "LK9 4EC",
        latitude: 53.7368,
        longitude: -1.4251,
        openingHours: weeklyHours(weekdays, "08:00", "18:00"),
      },
    ],
  },
  {
    shortCode: "ODS",
    name: "Otterwick Day Surgery",
    kind: "customer",
    billingEmail: "finance@otterwick.example",
    sites: [
      {
        name: "Otterwick Day Surgery Centre",
        addressLine1: "2 Pennistow Lane",
        town: "Otterwick",
        postcode: "LK12 6DS",
        latitude: 53.6541,
        longitude: -1.6017,
        openingHours: weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat"], "07:30", "19:30"),
        deliveryNotes: "Park in the two bays marked for deliveries; sterile store is on the ground floor.",
        contactName: "Benedikt Rowe",
        contactPhone: "01632 960 620",
      },
      {
        name: "Hesketh Fold Treatment Rooms",
        addressLine1: "61 Hesketh Fold",
        town: "Otterwick",
        postcode: "LK12 7HF",
        latitude: 53.6472,
        longitude: -1.6234,
        openingHours: weeklyHours(["mon", "tue", "thu"], "09:00", "16:00"),
      },
    ],
  },
  {
    shortCode: "MDP",
    name: "Marrowgate Dental Partners",
    kind: "customer",
    billingEmail: "office@marrowgate.example",
    sites: [
      {
        name: "Tanner Row Dental",
        addressLine1: "9 Tanner Row",
        town: "Marrowgate",
        postcode: "LK6 1TR",
        latitude: 53.6883,
        longitude: -1.3561,
        openingHours: dentalHours,
        contactName: "Tomasz Ebbing",
        contactPhone: "01632 960 730",
      },
      {
        name: "Millbeck Dental",
        addressLine1: "Millbeck Parade, Unit 3",
        town: "Marrowgate",
        postcode: "LK6 2MB",
        latitude: 53.6952,
        longitude: -1.3329,
        openingHours: dentalHours,
      },
      {
        name: "Cowl Street Dental",
        addressLine1: "40 Cowl Street",
        town: "Hobbin Cross",
        postcode: "LK5 8CS",
        latitude: 53.7214,
        longitude: -1.5698,
        openingHours: dentalHours,
        deliveryNotes: "Side door on Cowl Street; no parking in front between 08:00 and 09:30.",
      },
    ],
  },
  {
    shortCode: "PVC",
    name: "Pellowfield Veterinary Clinic",
    kind: "customer",
    billingEmail: "accounts@pellowfield.example",
    sites: [
      {
        name: "Pellowfield Veterinary Clinic",
        addressLine1: "Yarrow Barn, Pellowfield Road",
        town: "Pellowfield",
        postcode: "LK15 3VC",
        latitude: 53.6215,
        longitude: -1.4489,
        openingHours: { ...weeklyHours(weekdays, "08:00", "19:00"), sat: [{ start: "09:00", end: "13:00" }] },
        contactName: "Gideon Marsh",
        contactPhone: "01632 960 840",
      },
    ],
  },
];
