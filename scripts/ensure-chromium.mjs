// Browser tests drive Debian's Chromium. Install it when missing and we may (root with apt); otherwise say how.
import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
if (!existsSync(chromium)) {
  const isRoot = process.getuid?.() === 0;
  const hasApt = existsSync("/usr/bin/apt-get");
  if (!isRoot || !hasApt) {
    console.error(`Chromium is missing at ${chromium}. Install it with: sudo apt-get install -y chromium`);
    process.exit(1);
  }
  console.log("Installing Debian's chromium package for the browser tests…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit", env });
  execFileSync("apt-get", ["install", "-y", "-qq", "chromium"], { stdio: "inherit", env });
}
