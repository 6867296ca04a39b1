export default function Loading() {
  // data-loading: the page is still streaming in (browser tests wait for it to go).
  return (
    <p className="muted" role="status" data-loading="">
      Loading…
    </p>
  );
}
