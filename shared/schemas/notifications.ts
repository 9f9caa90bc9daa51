import * as z from "zod";
import { IdSchema, text } from "./common";

/** What a notification is about; each person can turn the e-mail of each kind off. */
export const NOTIFICATION_KINDS = [
  "revision.submitted",
  "revision.returned",
  "revision.approved",
  "report.ready",
  "report.returned",
  "report.released",
  "report.sent",
  "report.question",
  "report.acknowledged",
  "report.measurements",
] as const;
export const NotificationKindSchema = z.enum(NOTIFICATION_KINDS, { message: "unknown notification kind" });
export type NotificationKind = z.infer<typeof NotificationKindSchema>;

/** The kinds in words, for the settings and the mail's footer. */
export const NOTIFICATION_KIND_LABELS: Record<NotificationKind, string> = {
  "revision.submitted": "A stack revision waits for review",
  "revision.returned": "Your revision was sent back",
  "revision.approved": "Your revision was approved",
  "report.ready": "A supplier report waits for release",
  "report.returned": "Your report draft was sent back",
  "report.released": "Your report was released",
  "report.sent": "Your report was sent to the supplier",
  "report.question": "A supplier asked a question",
  "report.acknowledged": "A supplier acknowledged a report",
  "report.measurements": "A supplier sent measurements",
};

export const NotificationSchema = z.object({
  id: IdSchema,
  kind: NotificationKindSchema,
  title: text(),
  link: text(),
  projectId: IdSchema.nullable(),
  createdAt: text(),
  readAt: text().nullable(),
});
export type Notification = z.infer<typeof NotificationSchema>;
export const NotificationListSchema = z.object({ notifications: z.array(NotificationSchema), unread: z.number().int() });
export type NotificationList = z.infer<typeof NotificationListSchema>;

/** Marks the given notifications read, or all of one's own when `ids` is left out. */
export const MarkReadSchema = z.object({ ids: z.array(IdSchema).max(500, { message: "at most 500 ids" }).optional() });

export const NotificationSettingsSchema = z.object({
  kinds: z.array(z.object({ kind: NotificationKindSchema, label: text(), email: z.boolean() })),
});
export type NotificationSettings = z.infer<typeof NotificationSettingsSchema>;
export const UpdateNotificationSettingsSchema = z.object({
  email: z.partialRecord(NotificationKindSchema, z.boolean({ message: "each kind is true (mail me) or false" })),
});
