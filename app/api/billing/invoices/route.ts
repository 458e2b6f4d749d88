// GET /api/billing/invoices — invoices in the caller's scope, paged, sorted and filtered by status and age
import { listInvoices, listInvoicesQuerySchema } from "@/lib/billing/invoices";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("billing.view", async ({ req, db, user }) => listInvoices(db, user, parseQuery(req, listInvoicesQuerySchema)));
