import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { InviteMemberForm } from "@frontend/features/members/components/invite-member-form";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const supplier = {
  id: "0b9c2a4e-6f1d-4c3b-9a8e-2d7f5e1c4b3a",
  name: "Kestrel Bonding",
  kind: "assembly",
  contacts: [],
  createdAt: "2026-11-02T09:00:00.000Z",
  version: 1,
};

function invite(email: string) {
  fireEvent.change(screen.getByLabelText("E-mail address"), { target: { value: email } });
  fireEvent.click(screen.getByRole("button", { name: "Create invitation" }));
}

describe("InviteMemberForm", () => {
  it("asks for the supplier company of a supplier user before asking the server", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(201, {}));
    renderWithApp(<InviteMemberForm suppliers={[supplier]} />);
    fireEvent.change(screen.getByLabelText("Role"), { target: { value: "supplier" } });
    invite("line@supplier.example");
    expect(await screen.findByText("A supplier user must belong to a supplier company")).toBeTruthy();
    expect(fetchSpy).not.toHaveBeenCalled();
  });

  it("puts a field message of a 400 beside its field and a message without one above the form", async () => {
    let answer = jsonResponse(400, {
      error: { code: "validation", message: "Check the fields", fields: [{ path: "email", message: "is already a member" }] },
    });
    const fetchSpy = mockFetch(() => answer);
    renderWithApp(<InviteMemberForm suppliers={[]} />);
    invite("taken@example.com");
    const fieldMessage = await screen.findByText("Is already a member");
    expect(screen.getByLabelText("E-mail address").getAttribute("aria-describedby")).toBe(fieldMessage.id);
    expect(JSON.parse(String((fetchSpy.mock.calls[0][1] as RequestInit).body))).toMatchObject({
      email: "taken@example.com",
      role: "engineer",
      supplierId: null,
    });

    answer = jsonResponse(409, { error: { code: "conflict", message: "An invitation for this address is still open" } });
    invite("open@example.com");
    expect(await screen.findByText("An invitation for this address is still open")).toBeTruthy();
    await waitFor(() => expect(screen.queryByText("Is already a member")).toBeNull());
  });
});
