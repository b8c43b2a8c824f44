// The study page of `limitline serve` in a real browser: Debian's Chromium driven by
// puppeteer-core (pinned in package-lock.json, installed into the build tree by setup.cmake).
// It starts the server, opens the URL it prints, uploads a real weather year, changes a
// dry-bulb setpoint and checks that the ranked table and the chart change, types a value the
// unit file refuses and checks the one-line error beside the field, clicks the chart for a
// point check, downloads the unit file and runs it through `limitline year --format json`,
// whose hours must be the ones the page shows. Screenshots go to WORK_DIR, never to the
// repository.
//
// usage: node serve_in_browser.js LIMITLINE_EXE WORK_DIR SOURCE_DIR
'use strict';
const { spawn, execFileSync } = require('child_process');
const fs = require('fs');
const path = require('path');
const puppeteer = require('puppeteer-core');

const [exe, work, source] = process.argv.slice(2);
if (!exe || !work || !source) {
  console.error('usage: node serve_in_browser.js LIMITLINE_EXE WORK_DIR SOURCE_DIR');
  process.exit(2);
}
fs.mkdirSync(work, { recursive: true });
const chromium = ['/usr/bin/chromium', '/usr/bin/chromium-browser'].find((c) => fs.existsSync(c));
if (!chromium) {
  console.error('serve_in_browser: Chromium is not installed (Debian package chromium; run bash .ci/setup)');
  process.exit(1);
}
// The real weather year of the repository (tests/data/SOURCES.md).
const weatherFile = path.join(source, 'tests', 'data', 'greensboro-nc-tmy3.csv');

let failures = 0;
function check(ok, what) {
  if (!ok) failures++;
  console[ok ? 'log' : 'error'](`${ok ? 'ok' : 'FAIL'}: ${what}`);
}

// The server, and the URL of the first line of its standard output.
function startServer() {
  const child = spawn(exe, ['serve', '--port', '0'], { stdio: ['ignore', 'pipe', 'inherit'] });
  return new Promise((resolve, reject) => {
    let out = '';
    child.stdout.on('data', (d) => {
      out += d;
      const nl = out.indexOf('\n');
      if (nl >= 0) resolve({ child, url: out.slice(0, nl) });
    });
    child.on('exit', (code) => reject(new Error(`limitline serve exited with ${code}`)));
  });
}

// The results are drawn when body[data-results] changes: wait for a new generation.
async function nextResults(page, before) {
  await page.waitForFunction((b) => document.body.dataset.results && document.body.dataset.results !== b &&
                                    document.getElementById('status').textContent.startsWith('up to date'),
                             { timeout: 60000 }, before);
  return page.evaluate(() => document.body.dataset.results);
}

const tableText = (page) => page.$$eval('#ranking tbody tr', (rows) => rows.map((r) => r.innerText));
const chartSvg = (page) => page.evaluate(async () => (await fetch(document.getElementById('chart').src)).text());

async function main() {
  const { child, url } = await startServer();
  check(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[0-9a-f]{32}$/.test(url), `the first line is the URL (${url})`);
  const browser = await puppeteer.launch({
    executablePath: chromium, headless: true, userDataDir: path.join(work, 'serve-profile'),
    args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-extensions'],
  });
  try {
    const page = await browser.newPage();
    await page.setViewport({ width: 1280, height: 900 });
    const problems = [];
    page.on('pageerror', (e) => problems.push(e.message));
    // The browser logs each answer over 399 as an error; the refused value below is one, on purpose.
    page.on('console', (m) => {
      if (m.type() === 'error' && !/status of 422/.test(m.text())) problems.push(m.text());
    });
    await page.goto(url);
    let gen = await nextResults(page, '');
    check((await tableText(page)).length >= 3, 'the demo ranks its strategies');

    // A real weather year, uploaded.
    const demoTable = await tableText(page), demoChart = await chartSvg(page);
    await (await page.$('#weather-file')).uploadFile(weatherFile);
    gen = await nextResults(page, gen);
    check(await page.$eval('#weather-name', (e) => e.textContent === 'greensboro-nc-tmy3.csv'),
          'the weather shown is the uploaded file');
    const before = await tableText(page), chartBefore = await chartSvg(page);
    check(before.join() !== demoTable.join() && chartBefore !== demoChart, 'another climate: the table and the chart change');

    // The first strategy's dry-bulb setpoint, changed.
    const field = await page.$('input[data-path="strategy[1].dry_bulb_limit"]');
    check(field !== null, 'the form offers the first strategy\'s dry-bulb limit');
    await field.click({ clickCount: 3 });
    await field.type('58F');
    await page.keyboard.press('Tab');
    gen = await nextResults(page, gen);
    const after = await tableText(page), chartAfter = await chartSvg(page);
    check(after.join() !== before.join(), 'the table changes with the dry-bulb setpoint');
    check(chartAfter !== chartBefore && chartAfter.includes('58.0'), 'the chart changes with it (its limit drawn at 58 °F)');
    await page.screenshot({ path: path.join(work, 'serve-page.png'), fullPage: true });

    // A value the unit file refuses: the one-line error beside the field, results unchanged.
    const supply = await page.$('input[data-path="air_handler.supply_air_temp"]');
    await supply.click({ clickCount: 3 });
    await supply.type('99F');
    await page.keyboard.press('Tab');
    await page.waitForFunction(() => document.querySelector('input.invalid'), { timeout: 30000 });
    const error = await page.$eval('input.invalid + p.error', (e) => e.textContent);
    check(/^demo-harbourside\.toml:\d+: air_handler\.supply_air_temp: /.test(error), `the unit file's error is shown: ${error}`);
    check((await tableText(page)).join() === after.join(), 'a refused value leaves the results as they were');
    await supply.click({ clickCount: 3 });
    await supply.type('55F');
    await page.keyboard.press('Tab');
    gen = await nextResults(page, gen);

    // A point clicked on the chart is checked against every strategy.
    // The point 24 °C (75.2 °F) at humidity ratio 0.010, placed by the chart's own map (dry-bulb
    // linear in x, humidity ratio in y, ChartGeometry in report/chart.hpp) and the image's scale.
    const chart = await page.$('#chart');
    const a = JSON.parse(await page.$eval('#chart', (e) => e.dataset.axes));
    const size = await page.$eval('#chart', (e) => [e.clientWidth, e.clientHeight]);
    const sx = a.left + (24 - a.dry_bulb_min_c) / (a.dry_bulb_max_c - a.dry_bulb_min_c) * a.width;
    const sy = a.top + a.height - 0.010 / a.humidity_ratio_max * a.height;
    await chart.click({ offset: { x: (sx - a.view_box.x) / a.view_box.w * size[0],
                                  y: (sy - a.view_box.y) / a.view_box.h * size[1] } });
    await page.waitForFunction(() => !document.getElementById('check').hidden &&
                                     document.getElementById('check').textContent !== '', { timeout: 30000 });
    const checkText = await page.$eval('#check', (e) => e.innerText);
    const clicked = /^Outdoor ([\d.]+) °F, dew point ([\d.]+) °F/.exec(checkText);
    // One pixel is about 0.15 °F across and 0.2 °F of dew point here; 0.4 °F allows two. The
    // dew point of w = 0.010 at the demo's 14.68 psia (101.2 kPa): vapour pressure
    // p_w = W p / (0.621945 + W) = 1.601 kPa (ASHRAE Handbook Fundamentals ch. 1, eq. 20),
    // which is the saturation pressure at 14.0 °C = 57.3 °F (ch. 1 Table 3: 1.5990 kPa at
    // 14 °C; from memory).
    check(clicked && Math.abs(Number(clicked[1]) - 75.2) <= 0.4 && Math.abs(Number(clicked[2]) - 57.3) <= 0.6 &&
          checkText.includes('limitline check'), `the clicked point is checked where it was clicked: ${checkText.split('\n')[0]}`);

    // The unit file download, run beside the weather through the command, gives the page's hours.
    const downloads = path.join(work, 'serve-downloads');
    fs.rmSync(downloads, { recursive: true, force: true });
    fs.mkdirSync(downloads, { recursive: true });
    const cdp = await page.createCDPSession();
    await cdp.send('Browser.setDownloadBehavior', { behavior: 'allow', downloadPath: downloads });
    await page.click('#dl-unit');
    const saved = path.join(downloads, 'demo-harbourside.toml');
    for (let i = 0; i < 600 && !fs.existsSync(saved); i++) await new Promise((r) => setTimeout(r, 50));
    check(fs.existsSync(saved), 'the unit file downloads');
    fs.copyFileSync(weatherFile, path.join(downloads, 'greensboro-nc-tmy3.csv'));
    const year = JSON.parse(execFileSync(exe, ['year', saved, '--format', 'json'], { encoding: 'utf8' }));
    const shown = await page.$$eval('#ranking tbody tr', (rows) => rows.map((r) => [r.dataset.strategy,
      r.cells[5].textContent, r.cells[6].textContent, r.cells[7].textContent]));
    const fmt = (v) => Number(v).toLocaleString('en-US', { maximumFractionDigits: 0 });
    const same = shown.filter(([n]) => year.results[n] && year.results[n].kind === 'strategy').every(([n, e, h, m]) =>
      e === fmt(year.results[n].hours_economizing) && h === fmt(year.results[n].harmful_hours) &&
      m === fmt(year.results[n].missed_hours));
    check(shown.length === Object.keys(year.results).length && same,
          'limitline year on the downloaded unit file gives the hours the page shows');

    // The page at a phone's width: one column, nothing wider than the window.
    await page.setViewport({ width: 390, height: 800 });
    const wide = await page.evaluate(() => document.documentElement.scrollWidth);
    check(wide <= 390, `at 390 px the page is not wider than the window (${wide} px)`);
    await page.screenshot({ path: path.join(work, 'serve-page-390.png'), fullPage: false });
    check(problems.length === 0, `no script errors in the page${problems.length ? ': ' + problems.join('; ') : ''}`);
  } finally {
    await browser.close();
    child.kill('SIGINT');
  }
  const code = await new Promise((r) => child.on('exit', (c) => r(c)));
  check(code === 0, 'Ctrl-C stops the server with exit 0');
  if (failures) {
    console.error(`serve_in_browser: ${failures} check(s) failed`);
    process.exit(1);
  }
  console.log('serve_in_browser: all checks passed');
}

main().catch((e) => {
  console.error(`serve_in_browser: ${e.stack || e}`);
  process.exit(1);
});
