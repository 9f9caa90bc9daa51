/**
 * Sending a released report (issue 11 item 3): the engineer chooses which of the supplier's
 * contacts receive it, copies in addresses and picks the attachments; the dialog sends exactly
 * that; a bad address is refused under the CC box before sending, the server's refusal of a
 * contact under the recipients; with no recipient nothing can be sent.
 */
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { Report } from "@shared/schemas/reports";
import { SendDialog } from "@frontend/features/reports/components/send-report-dialog";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const ID = "11111111-1111-4111-8111-111111111111";
// the dialog reads the report's id, code, revision and supplier only
const report = { id: ID, code: "TR-0007", revision: 2, supplierName: "Larkfield Assembly" } as Report;
const A = { id: "22222222-2222-4222-8222-222222222222", name: "Ana Lind", email: "ana@larkfield.example" };
const B = { id: "33333333-3333-4333-8333-333333333333", name: "Bo Kerr", email: "bo@larkfield.example" };

describe("SendDialog", () => {
  it("sends to the chosen contacts with the CC addresses and the chosen files, and shows what is refused where it belongs", async () => {
    const sent: unknown[] = [];
    mockFetch(({ url, method, body }) => {
      if (url === `/api/reports/${ID}/send` && method === "POST") {
        sent.push(body);
        return jsonResponse(400, {
          error: {
            code: "invalid_input",
            message: "The request has invalid fields.",
            fields: [{ path: "contactIds[0]", message: "not a contact of Larkfield Assembly" }],
          },
        });
      }
      return jsonResponse(404, { error: { code: "not_found", message: url } });
    });
    renderWithApp(<SendDialog report={report} contacts={[A, B]} onClose={() => undefined} onSent={() => undefined} />);
    const dialog = screen.getByRole("dialog", { name: /^Send TR-0007 revision 2 to Larkfield Assembly$/ });
    const recipients = within(dialog).getByRole("list", { name: "Recipients" });
    const box = (name: string) => within(recipients).getByRole("checkbox", { name: new RegExp(name) }) as HTMLInputElement;
    // every contact is chosen to begin with
    expect([box("Ana Lind").checked, box("Bo Kerr").checked]).toEqual([true, true]);
    fireEvent.click(box("Ana Lind"));
    expect(box("Ana Lind").checked).toBe(false);
    const cc = within(dialog).getByLabelText(/^CC/);
    fireEvent.click(within(dialog).getByRole("checkbox", { name: "PDF" }));
    fireEvent.click(within(dialog).getByRole("checkbox", { name: "CSV" }));

    // an address that is none is refused under the CC box before anything is sent
    fireEvent.change(cc, { target: { value: "buyer@quill.example; qa@" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Send report" }));
    await within(dialog).findByText(/must be a valid e-mail address/i);
    expect(sent).toEqual([]);

    fireEvent.change(cc, { target: { value: "buyer@quill.example; QA@Larkfield.example" } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Send report" }));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toEqual({ contactIds: [B.id], cc: ["buyer@quill.example", "qa@larkfield.example"], attachments: ["csv"] });
    // the server's refusal of a chosen contact is shown under the recipients
    await within(dialog).findByText(/not a contact of Larkfield Assembly/i);

    // with nobody chosen there is nothing to send
    fireEvent.click(box("Bo Kerr"));
    expect((within(dialog).getByRole("button", { name: "Send report" }) as HTMLButtonElement).disabled).toBe(true);
  }, 30_000);
});
