import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PROBLEM_TYPES, isProblemKind, problemTypeUri } from "@/lib/problem-types";

/** The page at an API problem type's URI (lib/problem-types.ts): what the problem means. */
export async function generateMetadata({ params }: { params: Promise<{ type: string }> }): Promise<Metadata> {
  const { type } = await params;
  return { title: isProblemKind(type) ? `Problem: ${PROBLEM_TYPES[type].title}` : "Problem type" };
}

export default async function ProblemTypePage({ params }: { params: Promise<{ type: string }> }) {
  const { type } = await params;
  if (!isProblemKind(type)) notFound();
  const { status, title, description } = PROBLEM_TYPES[type];
  return (
    <section>
      <h1>{title}</h1>
      <p>{description}</p>
      <dl>
        <dt>Problem type</dt>
        <dd>
          <code>{problemTypeUri(type)}</code>
        </dd>
        <dt>HTTP status</dt>
        <dd>{status}</dd>
      </dl>
      <p className="muted">
        API errors are <code>application/problem+json</code> (RFC 9457); match on <code>type</code>, not on the English <code>detail</code>. All
        types are listed in the <a href="/api/v1/openapi.json">OpenAPI document</a>.
      </p>
    </section>
  );
}
