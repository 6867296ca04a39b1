import type { ComponentProps, ReactNode } from "react";

/**
 * The one error banner of every page (issue 15): a server action's refusal, a problem the JSON
 * API answered to a page's script, a panelist link that does not work, the not-found and error
 * pages. One look (`.error-banner`) and role="alert", so a screen reader says it when it appears.
 * Messages for one field stay beside the field (`FieldError`, `.field-error`).
 */
export default function ErrorBanner({ title, children, ...rest }: Omit<ComponentProps<"div">, "role" | "className" | "title"> & { title?: string; children: ReactNode }) {
  return (
    <div className="error-banner" role="alert" {...rest}>
      {title ? <strong className="error-banner-title">{title}</strong> : null}
      <p>{children}</p>
    </div>
  );
}
