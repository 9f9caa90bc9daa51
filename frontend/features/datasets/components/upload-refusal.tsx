import { Alert } from "@frontend/components/ui/alert";
import { isApiError } from "@frontend/lib/api-client";

/** Why a file was refused: the server's sentence, and every row and column it listed. */
export function UploadRefusal({ error, onDismiss }: { error: unknown; onDismiss?: () => void }) {
  const message = isApiError(error) ? error.message : "The file could not be sent. Try again.";
  const fields = isApiError(error) ? error.fields.filter((f) => f.path !== "file") : [];
  return (
    <Alert title="The file was not accepted">
      <p>{message}</p>
      {fields.length > 1 ? (
        <ul className="mt-1.5 list-disc pl-4 text-xs" aria-label="Problems in the file">
          {fields.map((f) => (
            <li key={`${f.path}:${f.message}`}>
              <span className="font-semibold">{f.path}</span>: {f.message}
            </li>
          ))}
        </ul>
      ) : null}
      {onDismiss ? (
        <button type="button" onClick={onDismiss} className="mt-1.5 text-xs font-semibold underline underline-offset-2">
          Dismiss
        </button>
      ) : null}
    </Alert>
  );
}
