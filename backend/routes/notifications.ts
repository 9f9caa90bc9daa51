import { Router } from "express";
import {
  MarkReadSchema,
  NotificationListSchema,
  NotificationSettingsSchema,
  UpdateNotificationSettingsSchema,
} from "@shared/schemas/notifications";
import { ReviewQueueSchema } from "@shared/schemas/review-queue";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { actorOf, allow } from "../middleware/session";
import { listNotifications, markRead, notificationSettings, updateNotificationSettings } from "../services/notifications";
import { reviewQueue } from "../services/review-queue";

/** Everyone signed in has their own notifications and settings; nobody sees another's. Staff also have their review queue. */
export function notificationsRouter({ db }: AppDeps) {
  const r = Router();

  r.get("/notifications", allow("notifications.read"), async (req, res) => {
    send(res, NotificationListSchema, await listNotifications(db, actorOf(req)));
  });

  r.post("/notifications/read", allow("notifications.read"), async (req, res) => {
    const { ids } = parse(MarkReadSchema, req);
    send(res, NotificationListSchema, await markRead(db, actorOf(req), ids));
  });

  r.get("/notification-settings", allow("notifications.read"), async (req, res) => {
    send(res, NotificationSettingsSchema, await notificationSettings(db, actorOf(req)));
  });

  r.put("/notification-settings", allow("notifications.read"), async (req, res) => {
    const { email } = parse(UpdateNotificationSettingsSchema, req);
    send(res, NotificationSettingsSchema, await updateNotificationSettings(db, actorOf(req), email));
  });

  /** What waits for the signed-in member of staff, from the records themselves (the home page and the counts). */
  r.get("/review-queue", allow("reviews.read"), async (req, res) => {
    send(res, ReviewQueueSchema, await reviewQueue(db, actorOf(req)));
  });

  return r;
}
