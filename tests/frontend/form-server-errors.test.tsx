import { act, renderHook } from "@testing-library/react";
import { useForm } from "react-hook-form";
import { describe, expect, it } from "vitest";
import { ApiError } from "@frontend/lib/api-client";
import { firstErrorMessage, setServerErrors } from "@frontend/lib/form";

function formWith(error: unknown) {
  const { result } = renderHook(() => {
    const form = useForm({ defaultValues: { email: "", cc: "a@example.com, b", contactIds: ["c1"] } });
    void form.formState.errors; // read while rendering, as a form does, so the hook follows them
    return form;
  });
  act(() => setServerErrors(result.current, error));
  return result.current.formState.errors;
}

describe("setServerErrors", () => {
  it("puts each field's first message on the field the form holds, an item's on its list", () => {
    const errors = formWith(
      new ApiError(400, "invalid_input", "The request body is not valid.", [
        { path: "email", message: "must be a valid e-mail address" },
        { path: "email", message: "is too long" },
        { path: "cc.1", message: "must be a valid e-mail address" },
        { path: "contactIds[0]", message: "not a contact of Kestrel" },
      ]),
    );
    expect(errors.email?.message).toBe("must be a valid e-mail address");
    expect(errors.cc?.message).toBe("must be a valid e-mail address");
    expect(firstErrorMessage(errors.contactIds)).toBe("not a contact of Kestrel");
    expect(errors.root?.server).toBeUndefined();
  });

  it("sends a message for no field, or a field the form lacks, to the form as a whole", () => {
    expect(formWith(new ApiError(409, "conflict", "Changed by someone else.")).root?.server?.message).toBe("Changed by someone else.");
    const errors = formWith(new ApiError(400, "invalid_input", "Not valid.", [{ path: "supplierId", message: "no such supplier" }]));
    expect(errors.root?.server?.message).toBe("no such supplier");
    expect(formWith(new TypeError("Failed to fetch")).root?.server?.message).toBe("Something went wrong. Try again.");
  });
});
