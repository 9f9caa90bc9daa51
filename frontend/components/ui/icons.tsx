import type { SVGProps } from "react";

// A handful of line icons drawn for Orthostack on a 16-unit grid, 1.5 stroke.
type IconProps = SVGProps<SVGSVGElement> & { size?: number };

function Icon({ size = 16, children, ...rest }: IconProps) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 16 16"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.5}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      {...rest}
    >
      {children}
    </svg>
  );
}

export const ProjectsIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2" y="10.5" width="12" height="3" rx="0.75" />
    <rect x="3.5" y="6.5" width="9" height="3" rx="0.75" />
    <rect x="5.5" y="2.5" width="5" height="3" rx="0.75" />
  </Icon>
);
export const SuppliersIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2 13.5V6.5l4 2.5V6.5l4 2.5V3.5h4v10H2Z" />
    <path d="M5 11h1.5M9 11h1.5" />
  </Icon>
);
export const MembersIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="6" cy="5.5" r="2.5" />
    <path d="M1.75 13.5c.5-2.3 2.2-3.5 4.25-3.5s3.75 1.2 4.25 3.5" />
    <path d="M10.5 3.2a2.4 2.4 0 0 1 0 4.6M12 10.2c1.2.5 2 1.6 2.25 3.3" />
  </Icon>
);
export const ReportsIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M4 1.75h5.5L12.5 4.75v9.5H4z" />
    <path d="M9.25 1.75v3.25h3.25M6 8.5h4.5M6 11h3" />
  </Icon>
);
export const OutboxIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2 9.5h3l1 2h4l1-2h3v4H2z" />
    <path d="M8 2v6M5.5 4.5 8 2l2.5 2.5" />
  </Icon>
);
export const SearchIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="7" cy="7" r="4.25" />
    <path d="m10.25 10.25 3.5 3.5" />
  </Icon>
);
export const PlusIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 3v10M3 8h10" />
  </Icon>
);
export const PencilIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10.5 2.5 13.5 5.5 5.5 13.5H2.5v-3z" />
    <path d="m9 4 3 3" />
  </Icon>
);
export const TrashIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 4.25h11M6.25 4.25V2.5h3.5v1.75M4 4.25l.6 9.25h6.8l.6-9.25" />
    <path d="M6.75 7v4M9.25 7v4" />
  </Icon>
);
export const CloseIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="m4 4 8 8M12 4l-8 8" />
  </Icon>
);
export const CopyIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="5.5" y="5.5" width="8" height="8" rx="1.25" />
    <path d="M10.5 5.5V3.75c0-.7-.55-1.25-1.25-1.25h-5.5c-.7 0-1.25.55-1.25 1.25v5.5c0 .7.55 1.25 1.25 1.25H5.5" />
  </Icon>
);
export const CheckIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="m3 8.5 3 3 7-7" />
  </Icon>
);
export const SignOutIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M6.5 13.5h-3a1 1 0 0 1-1-1v-9a1 1 0 0 1 1-1h3" />
    <path d="M10.5 11 13.5 8l-3-3M13.5 8H6" />
  </Icon>
);
export const ChevronLeftIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 3.5 5.5 8l4.5 4.5" />
  </Icon>
);
export const AlertIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 1.75 14.75 13.5H1.25z" />
    <path d="M8 6.25v3.25M8 11.6v.05" />
  </Icon>
);
export const LinkIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M6.75 9.25a2.5 2.5 0 0 0 3.5 0l2.25-2.25a2.5 2.5 0 0 0-3.5-3.5L8.25 4.25" />
    <path d="M9.25 6.75a2.5 2.5 0 0 0-3.5 0L3.5 9a2.5 2.5 0 0 0 3.5 3.5l.75-.75" />
  </Icon>
);
export const MailIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="1.75" y="3.25" width="12.5" height="9.5" rx="1.25" />
    <path d="m2.25 4 5.75 4.5L13.75 4" />
  </Icon>
);

export const StatusIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M1.5 8.5h3l1.5-4 3 8 1.5-4h4" />
  </Icon>
);

/** A tray with an item dropping in: what waits for you. */
export const TrayIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2 9.5h3.25l1 1.75h3.5l1-1.75H14" />
    <path d="M2 9.5 3.5 3.5h9L14 9.5V13H2Z" />
    <path d="M8 4.75v3M6.75 6.5 8 7.75 9.25 6.5" />
  </Icon>
);

/** A box with a lid: archived. */
export const ArchiveIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2" y="3" width="12" height="3" rx="0.75" />
    <path d="M3 6v6.5a.5.5 0 0 0 .5.5h9a.5.5 0 0 0 .5-.5V6M6.5 8.5h3" />
  </Icon>
);
