import { Notice } from "./Notice";

/** Why an uploaded file was refused, with each bad line of it by number. */
export function FileRefusal({ message, lines }: { message: string; lines: readonly { line: number; message: string }[] }) {
  return (
    <Notice tone="error">
      <p>{message}</p>
      {lines.length ? (
        <ul className="mt-1 list-disc pl-5">
          {lines.map((r) => (
            <li key={r.line}>
              Line {r.line}: {r.message}
            </li>
          ))}
        </ul>
      ) : null}
    </Notice>
  );
}
