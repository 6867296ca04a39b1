// `npm test` runs this first (npm's "pretest"), with nothing but Node: on a fresh clone it installs
// the npm packages (`npm ci`). The suite checks figures against R's `stats` and `forecast` and
// drives the app in Debian's Chromium: on a Debian machine, as root, it installs what is missing
// and says so; anywhere else it names the packages in one line and stops.
import { execFileSync, spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

const has = (command, args) => spawnSync(command, args, { stdio: "ignore" }).status === 0;

function missingPackages() {
  const need = [];
  if (!has("Rscript", ["--version"])) need.push("r-base-core", "r-cran-forecast");
  else if (!has("Rscript", ["-e", 'quit(status = !requireNamespace("forecast", quietly = TRUE))'])) need.push("r-cran-forecast");
  if (!existsSync("/usr/bin/chromium")) need.push("chromium");
  return need;
}

if (!existsSync("node_modules/.package-lock.json")) {
  console.log("npm test: installing the npm packages (npm ci)");
  execFileSync("npm", ["ci", "--no-audit", "--no-fund"], { stdio: "inherit" });
}

const need = missingPackages();
if (need.length > 0) {
  const canInstall = process.getuid?.() === 0 && existsSync("/etc/debian_version") && has("apt-get", ["--version"]);
  if (!canInstall) {
    console.error(`npm test needs the Debian packages ${need.join(" ")}: install them as root (apt-get install --no-install-recommends ${need.join(" ")}) and run npm test again.`);
    process.exit(1);
  }
  console.log(`npm test: installing the Debian packages the tests use: ${need.join(" ")} (apt-get, as root)`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit", env });
  execFileSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...need], { stdio: "inherit", env });
  const still = missingPackages();
  if (still.length > 0) {
    console.error(`npm test: after apt-get install, still missing: ${still.join(" ")}.`);
    process.exit(1);
  }
}
