import fs from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const AXE_SOURCE = fs.readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

/**
 * axe-core's (npm) critical and serious violations on the page (or inside `within`), in words,
 * once the page's animations have settled and its fonts have loaded.
 */
export async function axeProblems(page: Page, within?: string): Promise<string[]> {
  // Colours are judged at rest: wait for running CSS animations and transitions (a dialog fading in).
  await page
    .waitForFunction(
      () => document.getAnimations().every((a) => a.playState !== 'running' || a.effect?.getTiming().iterations === Infinity),
      null,
      { timeout: 5_000 },
    )
    .catch(() => undefined);
  // Icons are judged as the icon font draws them: before it loads, a ligature reads as its word
  // ("visibility") and a button named "Show password" would seem to show other words.
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  // Evaluated through the browser's debugging protocol: the app's CSP rightly refuses inline scripts.
  await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async (sel) => {
    const axe = (
      globalThis as unknown as {
        axe: { run(ctx: unknown, opts: unknown): Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }> };
      }
    ).axe;
    const r = await axe.run(sel ? { include: [sel] } : document, { resultTypes: ['violations'] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, targets: v.nodes.slice(0, 3).map((n) => n.target.join(' ')) }));
  }, within ?? null);
  return violations
    .filter((v) => v.impact === 'critical' || v.impact === 'serious')
    .map((v) => `${v.impact} ${v.id}: ${v.targets.join(' | ')}`);
}
