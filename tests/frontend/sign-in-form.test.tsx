import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { SignInForm } from "@frontend/features/auth/components/sign-in-form";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

function fill(email: string, password: string) {
  fireEvent.change(screen.getByLabelText("E-mail address"), { target: { value: email } });
  fireEvent.change(screen.getByLabelText("Password"), { target: { value: password } });
  fireEvent.click(screen.getByRole("button", { name: "Sign in" }));
}

describe("SignInForm", () => {
  it("says plainly that the e-mail and password do not match", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(401, { code: "INVALID_EMAIL_OR_PASSWORD", message: "Invalid email or password" }));
    const onSignedIn = vi.fn();
    renderWithApp(<SignInForm onSignedIn={onSignedIn} />);
    fill("engineer@example.com", "wrong-password");

    expect(await screen.findByText("That e-mail address and password do not match an account.")).toBeTruthy();
    expect(onSignedIn).not.toHaveBeenCalled();
    expect(String(fetchSpy.mock.calls[0][0])).toContain("/api/auth/sign-in/email");
  });

  it("tells the person to wait when sign-in is rate limited", async () => {
    mockFetch(() => jsonResponse(429, { message: "Too many requests. Please try again later." }));
    renderWithApp(<SignInForm onSignedIn={() => {}} />);
    fill("engineer@example.com", "orthostack-demo");
    expect(await screen.findByText(/Too many sign-in attempts/)).toBeTruthy();
    expect(screen.getByText("Slow down")).toBeTruthy();
  });

  it("checks the form before asking the server", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(200, {}));
    renderWithApp(<SignInForm onSignedIn={() => {}} />);
    fill("not-an-address", "");
    expect(await screen.findByText("That is not an e-mail address")).toBeTruthy();
    expect(screen.getByText("Enter your password")).toBeTruthy();
    expect(fetchSpy).not.toHaveBeenCalled();
  });

  it("calls back once the server accepts the password", async () => {
    mockFetch(() => jsonResponse(200, { redirect: false, token: "t", user: { id: "u1", name: "Ezra", email: "engineer@example.com" } }));
    const onSignedIn = vi.fn();
    renderWithApp(<SignInForm onSignedIn={onSignedIn} />);
    fill("engineer@example.com", "orthostack-demo");
    await waitFor(() => expect(onSignedIn).toHaveBeenCalledTimes(1));
  });
});
