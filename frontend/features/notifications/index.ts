/** What other parts of the client use of notifications. */
export { useNotifications } from "./api/notifications";
export { NotificationMailSettings } from "./components/mail-settings";
export { NotificationsMenu } from "./components/notifications-menu";
