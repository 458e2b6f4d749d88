// GET /api/billing/invoices/:id — one invoice with its lines, evidence, payments and credit notes (the invoice page polls it)
import { getInvoiceDetail } from "@/lib/billing/invoices";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ id: string }>("billing.view", async ({ db, user, params }) => getInvoiceDetail(db, user, parseId(params.id, "That invoice")));
