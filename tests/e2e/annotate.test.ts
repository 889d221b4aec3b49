// End to end: a reference box drawn with the mouse, kept by autosave, exported, removed and
// imported again; a bad import; and the main controls reached and used with the keyboard alone.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { readFile, writeFile } from 'node:fs/promises';
import { basename } from 'node:path';
import type { Page } from 'playwright-core';
import { expectClose } from '../support/expect-close';
import { artifactPath, browserUnavailable, buildAndPreview, launchBrowser, type LaunchedBrowser, type ServedApp } from './browser';

const unavailable = browserUnavailable();
if (unavailable) console.log(unavailable);

/** The study the demo opens on, its set, and the sentence the box is drawn for (samples/phantom/set.json). */
const STUDY = 'phantom-0001';
const SET = 'phantom-2026';
const SENTENCE = 1; // "Both lungs are clear."; the study has no boxes of its own
const SENTENCE_TEXT = 'Both lungs are clear.';
const ANNOTATOR = 'e2e annotator';

/** One box as the reference boxes panel shows it (its data-* attributes). */
interface ShownBox {
  readonly id: string;
  readonly study: string;
  readonly sentence: number;
  readonly zone: string;
  readonly rect: readonly number[]; // x, y, w, h in image pixels
  readonly annotator: string;
  readonly created: string;
}

/** One box of an annotation file (tessera.annotations/2). */
interface FileBox {
  readonly id: string;
  readonly study: string;
  readonly sentence: { readonly index: number; readonly text: string; readonly hash: string };
  readonly zone: string;
  readonly box: { readonly x: number; readonly y: number; readonly w: number; readonly h: number };
  readonly annotator: string;
  readonly created: string;
}

interface AnnotationFileJson {
  schema: string;
  set: string;
  boxes: FileBox[];
  lungs?: { study: string }[];
}

function shownOf(b: FileBox): ShownBox {
  return { id: b.id, study: b.study, sentence: b.sentence.index, zone: b.zone, rect: [b.box.x, b.box.y, b.box.w, b.box.h], annotator: b.annotator, created: b.created };
}

async function openDemo(page: Page, url: string): Promise<void> {
  await page.goto(url);
  await page.locator('[data-best-cell]').first().waitFor({ timeout: 120_000 });
}

async function chooseSentence(page: Page, index: number): Promise<void> {
  await page.locator(`.t-report #t-sentence-${index}`).click();
  await expect.poll(() => page.locator('[data-best-cell]').textContent()).toMatch(new RegExp(`^Sentence ${index + 1}:`));
}

/** The boxes the reference boxes panel lists for the selected sentence. */
function shownBoxes(page: Page): Promise<ShownBox[]> {
  return page.$$eval('[data-box-id]', (items) =>
    items.map((el) => {
      const d = (el as HTMLElement).dataset;
      return {
        id: d.boxId ?? '',
        study: d.study ?? '',
        sentence: Number(d.sentence),
        zone: d.zone ?? '',
        rect: (d.rect ?? '').split(',').map(Number),
        annotator: d.annotator ?? '',
        created: d.created ?? '',
      };
    }),
  );
}

/**
 * Drags with the mouse over the study canvas from one image point to another. Mouse events carry
 * whole CSS pixels, so the corners are rounded on the page; returns the image rect those page
 * points stand for (canvas = image * scale + offset, the canvas's data-viewport).
 */
async function dragBox(page: Page, from: { x: number; y: number }, to: { x: number; y: number }): Promise<number[]> {
  const [scale, offsetX, offsetY] = ((await page.locator('.t-canvas').getAttribute('data-viewport')) ?? '').split(',').map(Number);
  const content = await page.locator('.t-canvas .konvajs-content').boundingBox();
  if (!content) throw new Error('the study canvas has no Konva stage on the page');
  const toPage = (p: { x: number; y: number }) => ({ x: Math.round(content.x + offsetX + p.x * scale), y: Math.round(content.y + offsetY + p.y * scale) });
  const toImage = (q: { x: number; y: number }) => ({ x: (q.x - content.x - offsetX) / scale, y: (q.y - content.y - offsetY) / scale });
  const a = toPage(from);
  const b = toPage(to);
  await page.mouse.move(a.x, a.y);
  await page.mouse.down();
  await page.mouse.move(b.x, b.y, { steps: 12 });
  await page.mouse.up();
  const p = toImage(a);
  const q = toImage(b);
  return [Math.min(p.x, q.x), Math.min(p.y, q.y), Math.abs(q.x - p.x), Math.abs(q.y - p.y)];
}

/** The annotation file text autosave keeps for the set in IndexedDB (src/app/state/autosave.ts). */
function savedText(page: Page): Promise<string | undefined> {
  return page.evaluate(
    (set) =>
      new Promise<string | undefined>((resolve, reject) => {
        const open = indexedDB.open('tessera-annotations');
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const db = open.result;
          if (!db.objectStoreNames.contains('annotations')) return resolve(undefined);
          const get = db.transaction('annotations').objectStore('annotations').get(set);
          get.onsuccess = () => {
            resolve((get.result as { text: string } | undefined)?.text);
            db.close();
          };
          get.onerror = () => reject(get.error);
        };
      }),
    SET,
  );
}

/** Picks a file through the app's own import control (its button opens the file chooser). */
async function importThroughPanel(page: Page, file: string): Promise<void> {
  const chooser = page.waitForEvent('filechooser');
  await page.getByRole('button', { name: /^Import boxes/ }).click();
  await (await chooser).setFiles(file);
}

/** The focused element and whether it shows a focus indicator (outline or box-shadow). */
interface FocusInfo {
  readonly what: string;
  readonly indicator: string | undefined;
}

function focused(page: Page): Promise<FocusInfo> {
  return page.evaluate(() => {
    const el = document.activeElement;
    if (!el || el === document.body) return { what: 'body', indicator: undefined };
    const cs = getComputedStyle(el);
    const name = el.getAttribute('aria-label') ?? ((el as HTMLInputElement).labels?.[0]?.textContent || el.textContent || '').trim().slice(0, 40);
    const what = `${el.tagName.toLowerCase()}${el.getAttribute('role') ? `[role=${el.getAttribute('role')}]` : ''} "${name}"`;
    const transparent = (c: string) => c === 'transparent' || /rgba\([^)]*,\s*0\)$/.test(c);
    const outlined = cs.outlineStyle !== 'none' && parseFloat(cs.outlineWidth) >= 2 && !transparent(cs.outlineColor);
    const shadowed = cs.boxShadow !== 'none';
    const indicator = outlined ? `outline ${cs.outlineWidth} ${cs.outlineStyle} ${cs.outlineColor}` : shadowed ? `box-shadow ${cs.boxShadow}` : undefined;
    return { what, indicator };
  });
}

describe.skipIf(unavailable !== undefined)('annotating with the explorer end to end (Chromium)', () => {
  let app: ServedApp;
  let browser: LaunchedBrowser;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    [app, browser] = await Promise.all([buildAndPreview(), launchBrowser()]);
    const origin = new URL(app.url).origin;
    await browser.context.route('**/*', async (route) => {
      const url = route.request().url();
      if (new URL(url).origin === origin || url.startsWith('blob:') || url.startsWith('data:')) await route.continue();
      else await route.abort('blockedbyclient');
    });
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  test('a box drawn by mouse survives reload, export and re-import identical; a bad file changes nothing', async () => {
    const page = await browser.context.newPage();
    page.on('pageerror', (e) => pageErrors.push(e.message));
    await openDemo(page, app.url);

    // Whose box it is: the annotator field stamps every new box.
    await page.getByLabel('Annotator').fill(ANNOTATOR);
    await page.getByLabel('Annotator').press('Tab');
    await chooseSentence(page, SENTENCE);
    expect(await shownBoxes(page)).toEqual([]);
    const boxesTool = page.getByRole('toolbar', { name: 'Study tools' }).getByRole('button', { name: 'Boxes', exact: true });
    await boxesTool.click();
    expect(await boxesTool.getAttribute('aria-pressed')).toBe('true');

    // Over the patient's left lower zone, which a frontal view shows on the viewer's right.
    const expectedRect = await dragBox(page, { x: 262, y: 262 }, { x: 352, y: 338 });
    await expect.poll(async () => (await shownBoxes(page)).length).toBe(1);
    await page.getByLabel(/^Zone of /).selectOption('left-lower');
    await expect.poll(async () => (await shownBoxes(page))[0].zone).toBe('left-lower');
    const [drawn] = await shownBoxes(page);
    expect({ ...drawn, rect: undefined, created: undefined }).toEqual({ id: drawn.id, study: STUDY, sentence: SENTENCE, zone: 'left-lower', rect: undefined, annotator: ANNOTATOR, created: undefined });
    expectClose(drawn.rect, expectedRect, 1e-6);
    expect(Number.isNaN(Date.parse(drawn.created))).toBe(false);
    expect(await page.locator(`#t-sentence-${SENTENCE}`).textContent()).toContain('1 box');
    await page.locator('.t-boxes').scrollIntoViewIfNeeded();
    await page.screenshot({ path: await artifactPath('annotate-1-drawn.png') });

    // Autosave has written the box (zone included) to IndexedDB before the page goes away.
    await expect
      .poll(async () => {
        const text = await savedText(page);
        return text ? (JSON.parse(text) as AnnotationFileJson).boxes.filter((b) => b.id === drawn.id).map(shownOf) : [];
      })
      .toEqual([drawn]);
    await page.reload();
    await page.locator('[data-best-cell]').first().waitFor({ timeout: 120_000 });
    await chooseSentence(page, SENTENCE);
    expect(await shownBoxes(page)).toEqual([drawn]);
    await page.locator('.t-boxes').scrollIntoViewIfNeeded();
    await page.screenshot({ path: await artifactPath('annotate-2-reloaded.png') });

    // Export through the app's own control (Results tab), and read the file it gives.
    await page.getByRole('tab', { name: 'Results' }).click();
    const downloading = page.waitForEvent('download');
    await page.getByRole('button', { name: 'Download annotation file' }).click();
    const download = await downloading;
    expect(download.suggestedFilename()).toBe('annotations.json');
    const exportPath = await artifactPath('annotate-export.json');
    await download.saveAs(exportPath);
    const exported = JSON.parse(await readFile(exportPath, 'utf8')) as AnnotationFileJson;
    expect(exported.schema).toBe('tessera.annotations/2');
    expect(exported.set).toBe(SET);
    const inFile = exported.boxes.filter((b) => b.id === drawn.id);
    expect(inFile.map(shownOf)).toEqual([drawn]);
    expect(inFile[0].sentence.text).toBe(SENTENCE_TEXT);
    const setBoxes = exported.boxes.length;
    // The Results tab takes most of the height; back to the matrix so the study shows again.
    await page.getByRole('tab', { name: 'Sentence × cell matrix' }).click();

    // Remove it with its Delete button, then bring it back from the exported file.
    await page.getByRole('button', { name: `Delete box ${drawn.id}` }).click();
    await expect.poll(() => shownBoxes(page)).toEqual([]);
    await page.locator('.t-boxes').scrollIntoViewIfNeeded();
    await page.screenshot({ path: await artifactPath('annotate-3-removed.png') });
    await importThroughPanel(page, exportPath);
    await expect.poll(() => shownBoxes(page)).toEqual([drawn]);
    const imported = page.getByRole('status').filter({ hasText: 'Imported 1 box' });
    expect(await imported.textContent()).toContain(`from ${basename(exportPath)}; ${setBoxes - 1} already here`);
    await page.locator('.t-boxes').scrollIntoViewIfNeeded();
    await page.screenshot({ path: await artifactPath('annotate-4-reimported.png') });

    // A file of a newer schema version is refused as a whole, with the reason.
    const newer = await artifactPath('annotate-newer-version.json');
    await writeFile(newer, JSON.stringify({ ...exported, schema: 'tessera.annotations/9' }));
    await importThroughPanel(page, newer);
    const refused = page.getByRole('alert').filter({ hasText: `Nothing was imported from ${basename(newer)}` });
    await refused.waitFor();
    expect(await refused.textContent()).toMatch(/version 9, newer than this Tessera reads/);
    expect(await shownBoxes(page)).toEqual([drawn]);
    await page.screenshot({ path: await artifactPath('annotate-5-newer-version.png') });

    // A file for another set's studies adds nothing and says which boxes were left out and why.
    const foreign = await artifactPath('annotate-other-studies.json');
    const moved = { ...exported, set: 'another-set', boxes: exported.boxes.map((b) => ({ ...b, study: `other-${b.study}` })), lungs: [] };
    await writeFile(foreign, JSON.stringify(moved));
    await importThroughPanel(page, foreign);
    const warned = page.locator('.t-message--warning').filter({ hasText: basename(foreign) });
    await warned.waitFor();
    const warning = (await warned.textContent()) ?? '';
    expect(warning).toContain(`Imported 0 boxes and 0 lung templates from ${basename(foreign)}`);
    expect(warning).toContain('the file is for set "another-set", not "phantom-2026"');
    expect(warning).toContain(`study "other-${STUDY}" is not in the set`);
    expect(await shownBoxes(page)).toEqual([drawn]);
    await warned.locator('summary').click();
    await page.screenshot({ path: await artifactPath('annotate-6-other-studies.png') });

    // Nothing of the refused files reached the saved copy either.
    await expect
      .poll(async () => {
        const saved = JSON.parse((await savedText(page)) ?? '{"boxes":[]}') as AnnotationFileJson;
        return [saved.boxes.length, saved.boxes.filter((b) => b.id === drawn.id).map(shownOf)];
      })
      .toEqual([setBoxes, [drawn]]);
    expect(pageErrors).toEqual([]);
    await page.close();
  });

  test('the keyboard alone reaches the main controls, each with a visible focus indicator; arrows move the sentence; the legend names cividis and its source', async () => {
    const page = await browser.context.newPage();
    page.on('pageerror', (e) => pageErrors.push(e.message));
    await openDemo(page, app.url);

    const visited: FocusInfo[] = [];
    /** Presses Tab until the focused element's description matches, recording every stop. */
    const tabTo = async (want: RegExp): Promise<FocusInfo> => {
      for (let i = 0; i < 80; i++) {
        await page.keyboard.press('Tab');
        const f = await focused(page);
        visited.push(f);
        if (want.test(f.what)) return f;
      }
      throw new Error(`Tab never reached ${want}; stops: ${visited.map((v) => v.what).join(' | ')}`);
    };

    await tabTo(/^button "Boxes"$/);
    await page.keyboard.press('Space');
    expect(await page.getByRole('button', { name: 'Boxes', exact: true }).getAttribute('aria-pressed')).toBe('true');
    await page.keyboard.press('v'); // back to Inspect by its key
    expect(await page.getByRole('button', { name: 'Inspect', exact: true }).getAttribute('aria-pressed')).toBe('true');

    await tabTo(/^select "Pool cells by"$/);
    await tabTo(/^ul\[role=listbox\] "Report sentences"$/);
    const selected = () => page.locator('.t-report [aria-selected="true"]').getAttribute('id');
    expect(await selected()).toBe('t-sentence-0');
    await page.keyboard.press('ArrowDown');
    expect(await selected()).toBe('t-sentence-1');
    await expect.poll(() => page.locator('[data-best-cell]').textContent()).toMatch(/^Sentence 2:/);
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('ArrowUp');
    expect(await selected()).toBe('t-sentence-1');
    await page.keyboard.press('End');
    expect(await selected()).toBe('t-sentence-5');
    await page.keyboard.press('Home');
    expect(await selected()).toBe('t-sentence-0');
    expect((await focused(page)).what).toBe('ul[role=listbox] "Report sentences"');
    await page.screenshot({ path: await artifactPath('keyboard-sentence-list.png') });

    await tabTo(/^button\[role=tab\] "Sentence × cell matrix"$/);
    for (let i = 0; i < 3; i++) await page.keyboard.press('ArrowRight');
    const resultsTab = await focused(page);
    visited.push(resultsTab);
    expect(resultsTab.what).toBe('button[role=tab] "Results"');
    await tabTo(/^button "Download annotation file"$/);
    await page.screenshot({ path: await artifactPath('keyboard-export.png') });
    const downloading = page.waitForEvent('download');
    await page.keyboard.press('Enter');
    expect((await downloading).suggestedFilename()).toBe('annotations.json');

    // The legend under the map names its scale and where the scale is published; so does the key list.
    // The scale's paper, from memory: Nuñez, Anderton and Renslow (2018), PLoS ONE 13(7): e0199239.
    const legend = page.locator('figure.t-legend');
    expect(await legend.textContent()).toContain('cividis colour scale');
    expect(await legend.textContent()).toContain('Nuñez, Anderton and Renslow 2018, PLoS ONE 13(7): e0199239');
    await legend.screenshot({ path: await artifactPath('legend.png') });
    await page.keyboard.press('?');
    const help = page.getByRole('dialog', { name: 'Keys' });
    expect(await help.textContent()).toContain('cividis colour scale (Nuñez, Anderton and Renslow 2018, PLoS ONE 13(7): e0199239)');
    const close = await focused(page);
    expect(close.what).toBe('button "Close"'); // the dialog takes the focus to its Close button
    visited.push(close);
    await page.keyboard.press('Escape');
    await help.waitFor({ state: 'detached' });

    const unmarked = visited.filter((v) => v.indicator === undefined).map((v) => v.what);
    expect(unmarked, 'focused elements without a visible focus indicator').toEqual([]);
    console.log(`keyboard walk: ${visited.length} stops, e.g. ${visited.slice(0, 3).map((v) => `${v.what}: ${v.indicator}`).join('; ')}`);
    expect(pageErrors).toEqual([]);
    await page.close();
  });
});
