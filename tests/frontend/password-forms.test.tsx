import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { ChangePasswordForm, ResetPasswordForm } from "@frontend/features/auth/components/password-forms";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe("ResetPasswordForm", () => {
  it("checks the length before asking the server", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(200, { status: true }));
    renderWithApp(<ResetPasswordForm token="tok" onDone={() => {}} />);
    fireEvent.change(screen.getByLabelText(/New password/), { target: { value: "short" } });
    fireEvent.click(screen.getByRole("button", { name: "Set the password" }));
    expect(await screen.findByText(/password must be at least 10 characters/i)).toBeTruthy();
    expect(fetchSpy).not.toHaveBeenCalled();
  });

  it("sends the token and the new password to the reset route, then calls back", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(200, { status: true }));
    const onDone = vi.fn();
    renderWithApp(<ResetPasswordForm token="tok-123" onDone={onDone} />);
    fireEvent.change(screen.getByLabelText(/New password/), { target: { value: "a-long-new-password" } });
    fireEvent.click(screen.getByRole("button", { name: "Set the password" }));
    await waitFor(() => expect(onDone).toHaveBeenCalledTimes(1));
    const [url, init] = fetchSpy.mock.calls[0];
    expect(String(url)).toContain("/api/auth/reset-password");
    expect(JSON.parse(String((init as RequestInit).body))).toMatchObject({ token: "tok-123", newPassword: "a-long-new-password" });
  });

  it("says so when the link cannot be used any more", async () => {
    mockFetch(() => jsonResponse(400, { code: "INVALID_TOKEN", message: "Invalid token" }));
    renderWithApp(<ResetPasswordForm token="used" onDone={() => {}} />);
    fireEvent.change(screen.getByLabelText(/New password/), { target: { value: "a-long-new-password" } });
    fireEvent.click(screen.getByRole("button", { name: "Set the password" }));
    expect(await screen.findByRole("alert")).toBeTruthy();
  });
});

describe("ChangePasswordForm", () => {
  it("asks the server to end the other sessions and confirms in words", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(200, { token: "t", user: { id: "u", name: "E", email: "e@example.com" } }));
    renderWithApp(<ChangePasswordForm />);
    fireEvent.change(screen.getByLabelText("Current password"), { target: { value: "old-password-1" } });
    fireEvent.change(screen.getByLabelText(/^New password/), { target: { value: "new-password-22" } });
    fireEvent.click(screen.getByRole("button", { name: "Change password" }));
    expect(await screen.findByText(/signed out everywhere else/)).toBeTruthy();
    const [url, init] = fetchSpy.mock.calls[0];
    expect(String(url)).toContain("/api/auth/change-password");
    expect(JSON.parse(String((init as RequestInit).body))).toMatchObject({ revokeOtherSessions: true, newPassword: "new-password-22" });
  });
});
