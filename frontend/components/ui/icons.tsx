import {
  Activity,
  Archive,
  Check,
  ChevronLeft,
  Copy,
  Factory,
  FileText,
  Inbox,
  Layers,
  Link,
  LogOut,
  Mail,
  Pencil,
  Plus,
  Search,
  Send,
  Trash2,
  TriangleAlert,
  Users,
  X,
  type LucideIcon,
  type LucideProps,
} from "lucide-react";

/*
 * The app's icons, from one set (lucide-react), under the names the screens use. All are drawn
 * the same way: 16 px, a 1.5 px line whatever the size, hidden from assistive technology (the
 * button or link beside them carries the words).
 */
type IconProps = LucideProps;

function icon(Glyph: LucideIcon) {
  const Named = ({ size = 16, strokeWidth = 1.5, ...rest }: IconProps) => (
    <Glyph size={size} strokeWidth={strokeWidth} absoluteStrokeWidth aria-hidden="true" focusable="false" {...rest} />
  );
  Named.displayName = `${Glyph.displayName ?? "Icon"}Icon`;
  return Named;
}

export const ProjectsIcon = icon(Layers);
export const SuppliersIcon = icon(Factory);
export const MembersIcon = icon(Users);
export const ReportsIcon = icon(FileText);
export const OutboxIcon = icon(Send);
export const SearchIcon = icon(Search);
export const PlusIcon = icon(Plus);
export const PencilIcon = icon(Pencil);
export const TrashIcon = icon(Trash2);
export const CloseIcon = icon(X);
export const CopyIcon = icon(Copy);
export const CheckIcon = icon(Check);
export const SignOutIcon = icon(LogOut);
export const ChevronLeftIcon = icon(ChevronLeft);
export const AlertIcon = icon(TriangleAlert);
export const LinkIcon = icon(Link);
export const MailIcon = icon(Mail);
export const StatusIcon = icon(Activity);
/** What waits for you. */
export const TrayIcon = icon(Inbox);
export const ArchiveIcon = icon(Archive);
