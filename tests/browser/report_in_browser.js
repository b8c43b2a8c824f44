// The study report, the audit record and the survey page opened in a real browser: headless
// Chromium (Debian package `chromium`, installed by .ci/setup) renders each page at 1280 px and
// 390 px wide, a small script in the page measures it, and screenshots are checked for content.
//
// At 1280 px no table may scroll sideways (each table's, and its wrapper's, scrollWidth within
// its clientWidth) and the page may not be wider than the window; at 390 px (a phone) the page
// may not be wider than the window either (tables may scroll inside their own wrapper). Every
// SVG must be laid out with a size, the page height must be in a plausible range, the
// screenshots must not be blank, and printing to PDF must give a document of several pages.
// Screenshots and PDFs go to the build folder given, never to the repository.
//
// usage: node report_in_browser.js LIMITLINE_EXE WORK_DIR SOURCE_DIR
'use strict';
const { execFileSync } = require('child_process');
const fs = require('fs');
const path = require('path');

const [exe, work, source] = process.argv.slice(2);
if (!exe || !work || !source) {
  console.error('usage: node report_in_browser.js LIMITLINE_EXE WORK_DIR SOURCE_DIR');
  process.exit(2);
}
fs.mkdirSync(work, { recursive: true });

function findChromium() {
  for (const c of ['/usr/bin/chromium', '/usr/bin/chromium-browser']) if (fs.existsSync(c)) return c;
  console.error('report_in_browser: Chromium is not installed (Debian package chromium; run bash .ci/setup)');
  process.exit(1);
}
const chromium = findChromium();

let failures = 0;
function check(ok, what) {
  if (!ok) {
    failures++;
    console.error(`FAIL: ${what}`);
  } else {
    console.log(`ok: ${what}`);
  }
}

function browser(args) {
  return execFileSync(chromium, [
    '--headless', '--no-sandbox', '--disable-gpu', '--hide-scrollbars', '--no-first-run',
    '--disable-extensions', `--user-data-dir=${path.join(work, 'profile')}`, ...args,
  ], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'], timeout: 60000, maxBuffer: 1 << 28 });
}

// The page with a probe that posts its measurements once laid out; any folded details are
// opened first, so every table is measured.
const kProbe = `<script>
window.addEventListener('load', function () {
  document.querySelectorAll('details').forEach(function (d) { d.open = true; });
  var tables = [].slice.call(document.querySelectorAll('table')).map(function (t) {
    var w = t.closest('.scroll') || t.parentElement;
    return { table: [t.scrollWidth, t.clientWidth], wrapper: [w.scrollWidth, w.clientWidth],
             right: t.getBoundingClientRect().right };
  });
  var svgs = [].slice.call(document.querySelectorAll('svg')).map(function (s) {
    var r = s.getBoundingClientRect(); return [r.width, r.height];
  });
  parent.postMessage(JSON.stringify({ window: innerWidth,
    page: document.documentElement.scrollWidth, height: document.documentElement.scrollHeight,
    tables: tables, svgs: svgs }), '*');
});
</script>`;

// Headless Chromium will not make a window narrower than 500 px, so the page is opened in a
// frame of the width under test: its media queries and layout see that width, and it posts
// its measurements to the wrapper, whose DOM the browser prints.
function wrapper(file, width, height, probe) {
  const w = file.replace(/\.html$/, `.${width}${probe ? '.probe' : ''}.wrap.html`);
  fs.writeFileSync(w, `<!DOCTYPE html><html><body style="margin:0">` +
    `<iframe src="${path.basename(file)}" style="border:0;display:block;width:${width}px;` +
    `height:${height}px"></iframe><script>window.addEventListener('message', function (e) {` +
    `var p = document.createElement('pre'); p.id = 'probe'; p.textContent = e.data;` +
    `document.body.appendChild(p); });</script></body></html>`);
  return w;
}

function measure(file, width) {
  const probed = file.replace(/\.html$/, `.probe.html`);
  fs.writeFileSync(probed, fs.readFileSync(file, 'utf8').replace('</body>', kProbe + '</body>'));
  const dom = browser([`--window-size=${Math.max(width, 500)},900`, '--virtual-time-budget=5000',
    '--dump-dom', 'file://' + wrapper(probed, width, 900, true)]);
  const m = dom.match(/<pre id="probe">([^<]*)<\/pre>/);
  if (!m) throw new Error(`no measurements from ${probed}`);
  return JSON.parse(m[1].replace(/&quot;/g, '"').replace(/&amp;/g, '&'));
}

function pngStats(png) {
  return JSON.parse(execFileSync('node', [path.join(source, 'tests/tools/png_stats.js'), png],
    { encoding: 'utf8' }));
}

function checkPage(name, file, expect) {
  for (const width of [1280, 390]) {
    const m = measure(file, width);
    const where = `${name} at ${width} px`;
    check(m.window === width, `${where}: the window is ${width} px (${m.window})`);
    check(m.page <= m.window, `${where}: the page is no wider than the window (${m.page})`);
    check(m.height >= expect.minHeight && m.height <= expect.maxHeight,
      `${where}: page height ${m.height} px within ${expect.minHeight}–${expect.maxHeight}`);
    check(m.svgs.length >= expect.svgs, `${where}: ${m.svgs.length} pictures (at least ${expect.svgs})`);
    check(m.svgs.every(([w, h]) => w > 100 && h > 100), `${where}: every picture laid out with a size`);
    check(m.tables.length >= expect.tables, `${where}: ${m.tables.length} tables (at least ${expect.tables})`);
    if (width === 1280)
      m.tables.forEach((t, i) => {
        check(t.table[0] <= t.table[1] + 1 && t.wrapper[0] <= t.wrapper[1] + 1,
          `${where}: table ${i + 1} fits without scrolling (${t.table[0]} in ${t.wrapper[1]} px)`);
      });
    // The whole page as a picture: not blank, in the page's colours and more.
    const png = path.join(work, `${name}-${width}.png`);
    const tall = Math.min(m.height, 16000);
    browser([`--window-size=${Math.max(width, 500)},${tall}`, `--screenshot=${png}`,
      'file://' + wrapper(file, width, tall, false)]);
    const s = pngStats(png);
    check(s.width === Math.max(width, 500), `${where}: screenshot ${s.width} px wide`);
    check(s.distinct > 500 && s.non_dominant > 0.05,
      `${where}: screenshot not blank (${s.distinct} colours, ${(100 * s.non_dominant).toFixed(1)}% off the dominant one)`);
  }
  const pdf = path.join(work, `${name}.pdf`);
  browser(['--no-pdf-header-footer', `--print-to-pdf=${pdf}`, 'file://' + file]);
  const bytes = fs.readFileSync(pdf);
  const pages = (bytes.toString('latin1').match(/\/Type\s*\/Page[^s]/g) || []).length;
  check(pages >= expect.pages, `${name} printed: ${pages} pages (at least ${expect.pages})`);
}

function limitline(args) {
  execFileSync(exe, args, { stdio: ['ignore', 'ignore', 'inherit'], cwd: source,
    env: { ...process.env, LIMITLINE_DATA_DIR: path.join(source, 'data') } });
}

const report = path.join(work, 'report.html');
limitline(['report', '-o', report]);
checkPage('report', report, { minHeight: 4000, maxHeight: 40000, svgs: 3, tables: 4, pages: 4 });

const si = path.join(work, 'report-mesa-si.html');
limitline(['report', '--demo', 'mesa-alta', '--units', 'si', '-o', si]);
checkPage('report-mesa-si', si, { minHeight: 4000, maxHeight: 40000, svgs: 3, tables: 4, pages: 4 });

const record = path.join(work, 'audit-record.html');
limitline(['audit', 'examples/audit-office.toml', 'examples/trend-office.csv', '--format', 'html',
  '-o', record]);
checkPage('audit-record', record, { minHeight: 2000, maxHeight: 20000, svgs: 1, tables: 3, pages: 2 });

const survey = path.join(work, 'survey.html');
limitline(['survey', 'examples/survey-sites.csv', 'examples/survey-office.toml', '--tune',
  '--format', 'html', '-o', survey]);
checkPage('survey', survey, { minHeight: 1500, maxHeight: 20000, svgs: 1, tables: 3, pages: 2 });

if (failures) {
  console.error(`${failures} check(s) failed; screenshots in ${work}`);
  process.exit(1);
}
console.log(`all checks passed; screenshots in ${work}`);
