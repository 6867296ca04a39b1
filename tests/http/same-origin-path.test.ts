/**
 * The one rule for where to go after signing in (lib/http/same-origin-path.ts). Expected values
 * follow the WHATWG URL Standard's parser (https://url.spec.whatwg.org/, "basic URL parser"): ASCII
 * tab and newline are removed from the input; in a special scheme (http, https) "\" is read as
 * "/"; a relative reference starting with two slashes names a host.
 */
import { describe, expect, it } from "vitest";
import { sameOriginPath } from "../../lib/http/same-origin-path";

const SITE = "https://triangulate.example";

describe("sameOriginPath", () => {
  it("keeps paths of this site with their query and fragment", () => {
    expect(sameOriginPath("/panels")).toBe("/panels");
    expect(sameOriginPath("/roster?x=1#top")).toBe("/roster?x=1#top");
    expect(sameOriginPath(`${SITE}/reports`, SITE)).toBe("/reports");
    expect(sameOriginPath("reports", SITE)).toBe("/reports"); // resolved against the site's root
  });

  it("refuses targets that a browser reads as another host", () => {
    for (const hostile of [
      "/\\evil.example/x", // "\" is "/" (special scheme): //evil.example/x
      "/\t/evil.example/x", // tab removed: //evil.example/x
      "/\n/evil.example/x", // newline removed: //evil.example/x
      "\\\\evil.example/x",
      "//evil.example/x",
      "https://evil.example/x",
      `${SITE}.evil.example/x`,
      "javascript:alert(1)",
      "http://triangulate.example/x", // another scheme is another origin
    ]) {
      expect(sameOriginPath(hostile, SITE), JSON.stringify(hostile)).toBeNull();
    }
  });

  it("never returns a path that starts with two slashes (which would name a host when followed)", () => {
    // "/.//evil.example": the path "//evil.example" after removing the "." segment (URL Standard, path state).
    expect(sameOriginPath("/.//evil.example/x", SITE)).toBe("/evil.example/x");
  });

  it("refuses what is not a string or is empty", () => {
    for (const v of [undefined, null, "", ["/panels"], 42]) expect(sameOriginPath(v)).toBeNull();
  });
});
