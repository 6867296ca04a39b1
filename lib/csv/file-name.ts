/**
 * Download file names made from titles (pure): "Wren-2 launch year (Quillmoor)" →
 * "wren-2-launch-year-quillmoor". Letters lose their accents (Unicode NFKD, combining marks
 * dropped), everything but a–z, 0–9 and "-" becomes one "-", at most `max` characters, cut at a
 * "-" where one is near; a title with nothing left gives `fallback`. Only these characters reach
 * the Content-Disposition header, so no title can break out of it or name a path.
 */
export function fileSlug(title: string, max = 60, fallback = "export"): string {
  const plain = title
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "");
  if (plain.length <= max) return plain || fallback;
  const cut = plain.slice(0, max);
  const dash = plain[max] === "-" ? max : cut.lastIndexOf("-");
  return (dash >= max / 2 ? cut.slice(0, dash) : cut).replace(/-+$/, "") || fallback;
}
