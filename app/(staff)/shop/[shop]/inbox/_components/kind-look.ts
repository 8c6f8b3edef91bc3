import { Banknote, CalendarPlus, CreditCard, ImageOff, ImageUp, Images, type LucideIcon, MailX, MessageCircleQuestionMark, MessageSquareOff, MessageSquareReply, PackageCheck, RotateCcw, Undo2, UserPlus } from "lucide-react";
import type { InboxKind } from "@/lib/shop-events";

/** Each kind's icon beside its label (the label carries the meaning; the icon helps the eye). */
export const KIND_ICON: Record<InboxKind, LucideIcon> = {
  owner_answered: MessageSquareReply,
  payment_received: Banknote,
  payment_failed: CreditCard,
  payment_refunded: Undo2,
  consent_given: ImageUp,
  consent_refused: ImageOff,
  consent_withdrawn: Images,
  follower_added: UserPlus,
  mail_undeliverable: MailX,
  text_undeliverable: MessageSquareOff,
  parts_received: PackageCheck,
  core_credit_owed: RotateCcw,
  owner_question: MessageCircleQuestionMark,
  booking_request: CalendarPlus,
};
