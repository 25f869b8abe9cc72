import { api, readJson } from "@/lib/auth/guard";
import { assertCanSend, getPurchaseOrder, markSent } from "@/db/queries/purchase-orders";
import { getShopSettings } from "@/db/queries/settings";
import { sendPoSchema } from "@/lib/validations/purchasing";
import { purchaseOrderMail } from "@/lib/mail/messages";
import { sendMail } from "@/lib/mail/send";
import { HttpError } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { poId: string };

/**
 * Sends the order: e-mails it to the supplier with the CSV attached (or, with `email: false`,
 * only records that it went another way), then moves a draft to "sent". A re-send of a sent
 * order e-mails it again. If the mail fails, the order stays as it was.
 */
export const POST = api<P>("POST /api/purchase-orders/[poId]/send", async ({ req, params, user }) => {
  const id = idParam(params.poId, "That purchase order");
  const { email } = await readJson(req, sendPoSchema);
  const po = await assertCanSend(id);
  let mail: { messageId: string; to: string } | null = null;
  if (email) {
    if (!po.supplierEmail)
      throw new HttpError(
        400,
        `${po.supplier} has no e-mail address: add one on the suppliers page, or mark the order sent without e-mail.`,
        { email: "The supplier has no e-mail address." },
      );
    const shop = await getShopSettings();
    const sent = await sendMail(purchaseOrderMail(po, shop.shopName), {
      kind: "purchase_order",
      ref: `po:${id}`,
      sentBy: user.id,
    });
    mail = { messageId: sent.messageId, to: po.supplierEmail };
  }
  await markSent(id, user.id, email ? "email" : "other");
  return { order: await getPurchaseOrder(id), mail };
});
