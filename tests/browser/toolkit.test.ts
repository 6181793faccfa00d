import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { plackettBurmanDesign } from "~/lib/ruggedness";
import { expectAccessible, signedIn, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

describe("mixture comparison, in the browser", () => {
  it("refuses a bad result beside its field, then compares, keeps the comparison in the history and prints its sheet", async () => {
    const { context, page } = await signedIn(running, "analyst2@ringbatch.example", "/lab");
    await page.getByRole("link", { name: "Compare mixtures" }).click();
    await page.waitForURL(`${running.server.url}/compare`);
    await expect.poll(() => page.getByText("No comparisons yet.").isVisible()).toBe(true);
    await page.getByRole("link", { name: "New comparison" }).click();
    await page.waitForURL(`${running.server.url}/compare/new`);
    await page.getByLabel("Precision statement and response").selectOption({ label: await optionLabel(page, "Passes to reach the target surface") });
    await page.getByLabel("Where the mixtures were tested").selectOption("same-lab");
    const [referenceName, trialName] = await page.getByLabel("Name").all();
    await referenceName!.fill("Plant mix 12 (river sand)");
    await trialName!.fill("Plant mix 12 (crushed sand)");
    const [referenceResults, trialResults] = await page.getByLabel("Results").all();
    await referenceResults!.fill("13, 14, 13");
    await trialResults!.fill("18, 17, x");
    await page.getByRole("button", { name: "Compare" }).click();
    await expect.poll(() => page.getByText('"x" is not a number; separate results with commas or spaces.').isVisible()).toBe(true);
    expect(await trialResults!.getAttribute("aria-invalid")).toBe("true");
    await trialResults!.fill("18, 17, 18");
    await page.getByRole("button", { name: "Compare" }).click();
    await page.waitForURL(/\/compare\/\d+$/);
    const verdict = await page.getByTestId("comparison-verdict").textContent();
    expect(verdict).toMatch(/^Plant mix 12 \(crushed sand\) took 4\.3 more passes on average than Plant mix 12 \(river sand\); the test cannot tell differences under \d+\.\d passes apart within one lab: the difference (is real|is within the test's own scatter)\./);
    await expect.poll(() => page.getByText("Comparison saved to your history.").isVisible()).toBe(true);
    await expectAccessible(page);
    await page.getByRole("link", { name: "← Your comparisons" }).click();
    await page.waitForURL(`${running.server.url}/compare`);
    await expect.poll(() => page.getByRole("cell", { name: "Plant mix 12 (crushed sand) vs Plant mix 12 (river sand)" }).isVisible()).toBe(true);
    await expectAccessible(page);
    await context.close();
  });
});

async function optionLabel(page: import("playwright-core").Page, containing: string) {
  const labels = await page.getByLabel("Precision statement and response").locator("option").allTextContents();
  const found = labels.find((l) => l.includes(containing));
  if (!found) throw new Error(`no option with ${containing} among ${labels.join(" | ")}`);
  return found;
}

describe("ruggedness study, in the browser", () => {
  it("shows the demo study's design, run sheet, effects with the half-normal plot, and the factor that matters", async () => {
    const { context, page } = await signedIn(running, "coordinator@ringbatch.example", "/studies");
    await page.getByRole("link", { name: "Ruggedness" }).click();
    await page.waitForURL(`${running.server.url}/ruggedness`);
    await page.getByRole("link", { name: "RG-2026-1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Factors — RG-2026-1");
    expect(await page.getByLabel("Factor 2 name").inputValue()).toBe("Time after placement when floating starts");
    await expectAccessible(page);

    await page.getByRole("link", { name: "Design & run sheet" }).click();
    await expect.poll(() => page.getByRole("heading", { name: "Run sheet — RG-2026-1", exact: true }).isVisible()).toBe(true);
    await expect.poll(() => page.getByText("Fresh concrete is caustic").first().isVisible()).toBe(true);
    expect(await page.locator("ol > li").count()).toBe(8);
    await expectAccessible(page);

    await page.getByRole("link", { name: "Effects" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Effects — RG-2026-1");
    // the chart is drawn in the browser, as SVG, once per response
    await expect.poll(() => page.locator("figure svg").count(), { timeout: 15_000 }).toBe(2);
    const significantRows = page.getByRole("row").filter({ has: page.getByText("yes", { exact: true }) });
    expect(await significantRows.count()).toBe(2);
    expect(await significantRows.first().textContent()).toContain("Time after placement when floating starts");
    await expectAccessible(page);

    await page.getByRole("link", { name: "Conclusions" }).click();
    await expect.poll(() => page.getByTestId("ruggedness-summary").textContent()).toMatch(/^Time after placement when floating starts matters/);
    await expectAccessible(page);
    await context.close();
  });
});

describe("a new ruggedness study, in the browser", () => {
  it("goes from factors to a laid-out design, refuses a bad result beside its box, takes the results and concludes", async () => {
    const { context, page } = await signedIn(running, "coordinator@ringbatch.example", "/studies");
    await page.goto(`${running.server.url}/ruggedness/new`);
    await page.getByLabel("Code").fill("RG-2027-9");
    await page.getByLabel("Title").fill("Screening of the float test before round 3");
    await page.getByRole("button", { name: "Create the study" }).click();
    await page.waitForURL(/\/ruggedness\/\d+$/);
    await page.getByLabel("Results per run").selectOption("1");
    const factors = [
      ["Float angle", "°", "5", "10"],
      ["Hole depth", "mm", "45", "55"],
      ["Operator", "", "A", "B"],
    ];
    for (const [i, [name, unit, low, high]] of factors.entries()) {
      await page.getByLabel(`Factor ${i + 1} name`).fill(name!);
      await page.getByLabel(`Factor ${i + 1} unit`).fill(unit!);
      await page.getByLabel(`Factor ${i + 1} low`).fill(low!);
      await page.getByLabel(`Factor ${i + 1} high`).fill(high!);
    }
    await page.getByRole("button", { name: "Save and lay out the design" }).click();
    await page.waitForURL(/\/design$/);
    await expect.poll(() => page.getByText("Plackett–Burman design of 8 runs for 3 factors, with 4 dummy columns").isVisible()).toBe(true);

    await page.getByRole("link", { name: "Results", exact: true }).click();
    await page.waitForURL(/\/results$/);
    await page.locator('input[name="r1_1_holes"]').fill("7.5");
    await page.getByRole("button", { name: "Save the results" }).click();
    await expect.poll(() => page.getByText("A pass count is a whole number.").isVisible()).toBe(true);
    // Float angle (column 1) moves both pass counts by 3; the rest is a small run-to-run wobble.
    const design = plackettBurmanDesign(8);
    for (let run = 1; run <= 8; run++) {
      const base = 3 * (design[run - 1]![0]! > 0 ? 1 : 0) + (run % 3 === 0 ? 1 : 0);
      await page.locator(`input[name="r${run}_1_holes"]`).fill(String(8 + base));
      await page.locator(`input[name="r${run}_1_surface"]`).fill(String(14 + base));
    }
    await page.getByRole("button", { name: "Save the results" }).click();
    await expect.poll(() => page.getByText("Results saved (16 in all).").isVisible()).toBe(true);
    await page.getByRole("link", { name: "Conclusions" }).click();
    await expect.poll(() => page.getByTestId("ruggedness-summary").textContent()).toMatch(/^Float angle matters/);
    await expectAccessible(page);
    await context.close();
  });
});

describe("the published statement's bundle, in the browser", () => {
  it("shows the SHA-256 of the zip it downloads", async () => {
    const { context, page } = await signedIn(running, "coordinator@ringbatch.example", "/studies");
    await page.getByRole("link", { name: "FF-2025-D" }).click();
    await page.getByRole("link", { name: "Statement" }).click();
    const shown = (await page.getByTestId("bundle-sha256").textContent({ timeout: 15_000 }))!;
    const href = (await page.getByRole("link", { name: /^Download FF-2025-D-statement-v1-bundle\.zip/ }).getAttribute("href"))!;
    const zip = await (await page.request.get(running.server.url + href)).body();
    expect(createHash("sha256").update(zip).digest("hex")).toBe(shown);
    await expectAccessible(page);
    await context.close();
  });
});
