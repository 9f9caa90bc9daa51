import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { NOTIFICATION_KIND_LABELS, NOTIFICATION_KINDS, type NotificationKind } from "@shared/schemas/notifications";
import { NotificationMailSettings } from "@frontend/features/notifications";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

/** A server that keeps the opt-outs it was sent, as backend/services/notifications.ts does. */
function server(initiallyOff: NotificationKind[] = []) {
  const off = new Set(initiallyOff);
  const answer = () =>
    jsonResponse(200, {
      kinds: NOTIFICATION_KINDS.map((kind) => ({ kind, label: NOTIFICATION_KIND_LABELS[kind], email: !off.has(kind) })),
    });
  return mockFetch(({ url, method, body }) => {
    if (url !== "/api/notification-settings") return jsonResponse(404, { error: { code: "not_found", message: "no" } });
    if (method === "PUT") {
      for (const [kind, on] of Object.entries((body as { email: Record<string, boolean> }).email)) {
        if (on) off.delete(kind as NotificationKind);
        else off.add(kind as NotificationKind);
      }
    }
    return answer();
  });
}

const box = (kind: NotificationKind) => screen.getByRole("checkbox", { name: NOTIFICATION_KIND_LABELS[kind] }) as HTMLInputElement;

describe("NotificationMailSettings", () => {
  it("offers a reviewer only the kinds mailed to reviewers, ticked as stored", async () => {
    server(["report.ready"]);
    renderWithApp(<NotificationMailSettings role="reviewer" />);
    await screen.findByRole("checkbox", { name: NOTIFICATION_KIND_LABELS["revision.submitted"] });
    expect(screen.getAllByRole("checkbox").map((c) => c.getAttribute("aria-label") ?? c.closest("label")?.textContent)).toEqual([
      NOTIFICATION_KIND_LABELS["revision.submitted"],
      NOTIFICATION_KIND_LABELS["report.ready"],
    ]);
    expect(box("revision.submitted").checked).toBe(true);
    expect(box("report.ready").checked).toBe(false);
  });

  // three round trips to the mocked server: more than the 5 s default on a loaded machine
  it("sends one kind's change and shows what the server stored", { timeout: 20_000 }, async () => {
    const fetchSpy = server();
    renderWithApp(<NotificationMailSettings role="engineer" />);
    await screen.findByRole("checkbox", { name: NOTIFICATION_KIND_LABELS["report.question"] });
    // an engineer is not a reviewer: the waiting-for-review kinds are not theirs
    expect(screen.queryByRole("checkbox", { name: NOTIFICATION_KIND_LABELS["revision.submitted"] })).toBeNull();
    expect(screen.getAllByRole("checkbox")).toHaveLength(8);

    fireEvent.click(box("report.question"));
    // the machine may be busy: the change goes to the server and back before the box shows it
    await waitFor(() => expect(box("report.question").checked).toBe(false), { timeout: 5000 });
    const put = fetchSpy.mock.calls.find(([, init]) => init?.method === "PUT");
    expect(JSON.parse(String(put?.[1]?.body))).toEqual({ email: { "report.question": false } });
    expect(box("report.acknowledged").checked).toBe(true);

    fireEvent.click(box("report.question"));
    await waitFor(() => expect(box("report.question").checked).toBe(true), { timeout: 5000 });
  });

  it("shows the server's refusal and keeps the stored state", async () => {
    mockFetch(({ method }) =>
      method === "PUT"
        ? jsonResponse(400, { error: { code: "invalid_input", message: "each kind is true (mail me) or false" } })
        : jsonResponse(200, { kinds: NOTIFICATION_KINDS.map((kind) => ({ kind, label: NOTIFICATION_KIND_LABELS[kind], email: true })) }),
    );
    renderWithApp(<NotificationMailSettings role="admin" />);
    await screen.findByRole("checkbox", { name: NOTIFICATION_KIND_LABELS["report.ready"] });
    expect(screen.getAllByRole("checkbox")).toHaveLength(NOTIFICATION_KINDS.length);
    fireEvent.click(box("report.ready"));
    expect(await screen.findByText("each kind is true (mail me) or false", undefined, { timeout: 5000 })).toBeTruthy();
    expect(box("report.ready").checked).toBe(true);
  });

  it("tells a supplier that nothing but the reports is mailed to them", async () => {
    server();
    renderWithApp(<NotificationMailSettings role="supplier" />);
    await screen.findByText(/Nothing is mailed to your role/);
    expect(screen.queryAllByRole("checkbox")).toHaveLength(0);
  });
});
