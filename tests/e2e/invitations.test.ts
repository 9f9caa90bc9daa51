import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { navLabels, openProjects, screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

/** The role the server has for a member, asked with the page's own session. */
async function memberRole(page: Page, email: string): Promise<string | undefined> {
  const res = await page.request.get("/api/members");
  const { members } = (await res.json()) as { members: Array<{ email: string; role: string }> };
  return members.find((m) => m.email === email)?.role;
}

describe("inviting a person", () => {
  it("admin invites an engineer; the invitee opens the link, sets a password and is in", async () => {
    const admin = await e2e.session();
    await signInAs(admin.page, "admin@example.com");
    await admin.page.getByRole("link", { name: "Members" }).click();
    await admin.page.getByRole("table", { name: "Members" }).waitFor();

    const form = admin.page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill("Noor.Castellanos@example.com");
    await form.getByLabel("Role").selectOption("engineer");
    await form.getByRole("button", { name: "Create invitation" }).click();

    const created = admin.page.getByRole("status", { name: "Invitation created" });
    await created.getByText("Invitation ready for noor.castellanos@example.com").waitFor();
    const link = await created.getByLabel("Invitation link").inputValue();
    expect(link).toMatch(new RegExp(`^${e2e.baseURL}/invite/[\\w-]{20,}$`));
    const pending = admin.page.getByRole("table", { name: "Pending invitations" });
    await pending.getByText("noor.castellanos@example.com").waitFor();
    await screenshot(admin.page, "members-invited");

    // A fresh browser context: nobody is signed in there.
    const invitee = await e2e.session();
    await invitee.page.goto(link);
    await invitee.page.getByRole("heading", { name: "Join Kestrel Wearables" }).waitFor();
    await expect(invitee.page.getByLabel("E-mail address").inputValue()).resolves.toBe("noor.castellanos@example.com");

    // The shared schema's rule shows before anything is sent.
    await invitee.page.getByLabel("Your name").fill("Noor Castellanos");
    await invitee.page.getByLabel("Choose a password").fill("short");
    await invitee.page.getByRole("button", { name: "Join Kestrel Wearables" }).click();
    await invitee.page.getByText("password must be at least 10 characters").waitFor();
    await screenshot(invitee.page, "invite-accept");

    await invitee.page.getByLabel("Choose a password").fill("gimbal-lock-2026");
    await invitee.page.getByRole("button", { name: "Join Kestrel Wearables" }).click();
    await invitee.page.waitForURL((url) => url.pathname === "/");
    await invitee.page.getByRole("heading", { name: "Waiting for you" }).waitFor();
    await expect(invitee.page.getByTestId("current-user").innerText()).resolves.toBe("Noor Castellanos");
    expect(await navLabels(invitee.page)).toEqual(["Home", "Projects", "Reports", "Suppliers"]);
    await openProjects(invitee.page);
    await invitee.page.getByRole("button", { name: "New project" }).waitFor();
    await screenshot(invitee.page, "invitee-signed-in");

    // The link works once.
    const again = await e2e.session();
    await again.page.goto(link);
    await again.page.getByRole("heading", { name: "This invitation cannot be used" }).waitFor();

    // The admin sees the new member, and the invitation is no longer open.
    await admin.page.reload();
    await admin.page.getByRole("table", { name: "Members" }).getByText("noor.castellanos@example.com").waitFor();
    await admin.page.getByText("No open invitations").waitFor();

    expect(unexpectedProblems(admin.problems)).toEqual([]);
    expect(unexpectedProblems(invitee.problems)).toEqual([]);
  });

  it("a supplier invitation needs the supplier company, and revoking stops the link", async () => {
    const admin = await e2e.session();
    await signInAs(admin.page, "admin@example.com");
    await admin.page.goto("/members");
    const form = admin.page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail address").fill("qa@larkfield.example.com");
    await form.getByLabel("Role").selectOption("supplier");
    await form.getByRole("button", { name: "Create invitation" }).click();
    await form.getByText("a supplier user must belong to a supplier company").waitFor();

    await form.getByLabel("Supplier company").selectOption({ label: "Larkfield Assembly" });
    await form.getByRole("button", { name: "Create invitation" }).click();
    const created = admin.page.getByRole("status", { name: "Invitation created" });
    const link = await created.getByLabel("Invitation link").inputValue();

    const pending = admin.page.getByRole("table", { name: "Pending invitations" });
    const row = pending.getByRole("row").filter({ hasText: "qa@larkfield.example.com" });
    await row.getByText("Larkfield Assembly").waitFor();
    await row.getByRole("button", { name: "Revoke" }).click();
    await admin.page.getByRole("dialog", { name: "Revoke this invitation?" }).getByRole("button", { name: "Revoke invitation" }).click();
    await row.waitFor({ state: "detached" });

    const invitee = await e2e.session();
    await invitee.page.goto(link);
    await invitee.page.getByRole("heading", { name: "This invitation cannot be used" }).waitFor();
    await screenshot(invitee.page, "invite-revoked");
  });
});

describe("members (admin)", () => {
  it("changes a role, and asks for the company when the new role is supplier", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "admin@example.com");
    await page.goto("/members");
    const table = page.getByRole("table", { name: "Members" });
    const role = table.getByLabel("Role of Rana Haddad");
    await role.selectOption("engineer");
    await expect.poll(async () => await memberRole(page, "reviewer@example.com")).toBe("engineer");

    await role.selectOption("supplier");
    const dialog = page.getByRole("dialog", { name: "Make Rana Haddad a supplier user" });
    await dialog.getByRole("button", { name: "Change role" }).click();
    await dialog.getByText("Choose the supplier company this person works for.").waitFor();
    await screenshot(page, "members-supplier-role");
    await dialog.getByLabel("Supplier company").selectOption({ label: "Fenmoor Substrates" });
    await dialog.getByRole("button", { name: "Change role" }).click();
    await table.getByRole("row").filter({ hasText: "Rana Haddad" }).getByText("Fenmoor Substrates").waitFor();
    expect(await memberRole(page, "reviewer@example.com")).toBe("supplier");

    await role.selectOption("reviewer");
    await expect.poll(async () => await memberRole(page, "reviewer@example.com")).toBe("reviewer");
    // The admin cannot demote or remove themself from this table.
    await expect(table.getByLabel("Role of Ada Okafor").count()).resolves.toBe(0);
    await expect(table.getByRole("button", { name: "Remove Ada Okafor" }).count()).resolves.toBe(0);
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});

describe("suppliers (admin)", () => {
  it("adds a company and a contact, and removes them again", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "admin@example.com");
    await page.getByRole("link", { name: "Suppliers" }).click();
    await page.getByRole("button", { name: "Add company" }).click();
    const dialog = page.getByRole("dialog", { name: "Add a supplier company" });
    await dialog.getByLabel("Company name").fill("Tamsin Die Foundry");
    await dialog.getByLabel("What they supply").selectOption("die");
    await dialog.getByRole("button", { name: "Add company" }).click();

    const card = page.getByRole("article", { name: "Tamsin Die Foundry" });
    await card.getByText("Die supplier").waitFor();
    await card.getByRole("button", { name: "Add contact" }).click();
    await card.getByLabel("Contact name").fill("Idris Marlowe");
    await card.getByLabel("Contact e-mail").fill("not-an-address");
    await card.getByRole("button", { name: "Add contact" }).click();
    await card.getByText("must be a valid e-mail address").waitFor();
    await card.getByLabel("Contact e-mail").fill("idris@tamsin.example.com");
    await card.getByRole("button", { name: "Add contact" }).click();
    await card.getByRole("link", { name: "idris@tamsin.example.com" }).waitFor();
    await screenshot(page, "suppliers-admin");

    await card.getByRole("button", { name: "Remove Idris Marlowe" }).click();
    await page.getByRole("dialog", { name: "Remove this contact?" }).getByRole("button", { name: "Remove contact" }).click();
    await card.getByText("No contacts yet.").waitFor();

    await card.getByRole("button", { name: "Delete Tamsin Die Foundry" }).click();
    await page.getByRole("dialog", { name: "Delete this supplier company?" }).getByRole("button", { name: "Delete company" }).click();
    await card.waitFor({ state: "detached" });
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});
