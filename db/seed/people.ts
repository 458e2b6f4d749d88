import type { Role } from "@/lib/auth/roles";

// The demo's invented people. Every name, address and organisation here is made up.

export const DEMO_PASSWORD = "lark-demo-2026";

export interface DemoPerson {
  name: string;
  email: string;
  role: Role;
  organisation: string; // short code
  site?: string; // site name, for clinic staff
}

export const DEMO_PEOPLE: DemoPerson[] = [
  { name: "Imogen Harcastle", email: "admin@larkmoor.example", role: "admin", organisation: "LSS" },
  { name: "Tobias Wrenfield", email: "dispatch@larkmoor.example", role: "dispatcher", organisation: "LSS" },
  { name: "Priya Daventree", email: "driver@larkmoor.example", role: "driver", organisation: "LSS" },
  { name: "Marek Hollin", email: "driver2@larkmoor.example", role: "driver", organisation: "LSS" },
  { name: "Sol Brackenbury", email: "tech@larkmoor.example", role: "technician", organisation: "LSS" },
  { name: "Janna Pikeworth", email: "tech2@larkmoor.example", role: "technician", organisation: "LSS" },
  { name: "Hester Quayle", email: "quality@larkmoor.example", role: "quality_lead", organisation: "LSS" },
  { name: "Rufus Ellingham", email: "finance@larkmoor.example", role: "finance", organisation: "LSS" },
  { name: "Nadia Ferrow", email: "manager@quillby.example", role: "clinic_manager", organisation: "QMH" },
  {
    name: "Owen Tilsley",
    email: "theatres@quillby.example",
    role: "clinic_staff",
    organisation: "QMH",
    site: "Quillby Moor General – Main Theatres",
  },
  {
    name: "Lena Aptorp",
    email: "daycase@quillby.example",
    role: "clinic_staff",
    organisation: "QMH",
    site: "Quillby Moor General – Day Case Unit",
  },
  { name: "Carys Belling", email: "manager@otterwick.example", role: "clinic_manager", organisation: "ODS" },
  {
    name: "Benedikt Rowe",
    email: "staff@otterwick.example",
    role: "clinic_staff",
    organisation: "ODS",
    site: "Otterwick Day Surgery Centre",
  },
  { name: "Farah Lindqvist", email: "manager@marrowgate.example", role: "clinic_manager", organisation: "MDP" },
  {
    name: "Tomasz Ebbing",
    email: "tanner@marrowgate.example",
    role: "clinic_staff",
    organisation: "MDP",
    site: "Tanner Row Dental",
  },
  { name: "Gideon Marsh", email: "manager@pellowfield.example", role: "clinic_manager", organisation: "PVC" },
];
