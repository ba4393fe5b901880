// Browser test of report.html: makes the report of the sample course with the coursewarden
// program, opens it in headless Chromium through the DevTools protocol (over a pipe; Node's
// standard library only) and checks that the page
//   - logs no console errors and throws no exceptions,
//   - makes no network request (only the report's own file:// URL is loaded),
//   - has its sections in order, the SVG charts, and one marker per hazard in the elevation
//     profile and in the plan view, each linked both ways with its hazard table row,
//   - carries the caution,
//   - has one marker per marshal post in the sector plans of the marshal briefing, each linked
//     both ways with its row, and one briefing page per sector that starts a new printed page
//     and fits on one A4 page,
//   - shows the finish row of schedule.csv and the grading verdicts of summary.json.
// It saves a full-page screenshot (report.png), one per section (report-<id>.png), one per
// briefing sector (report-sector-N.png) and an A4 print (report.pdf) in --artefacts as CI
// artefacts.
//
// Exit codes: 0 passed, 1 failed, 77 skipped (no Chromium on this machine; CTest SKIP_RETURN_CODE).
//
// With --mode event, the report comes from an event file that `coursewarden init` writes for the
// course (two start waves, a feed, a cut-off checkpoint and a time limit; two weather scenarios,
// the first folder is opened) and the artefacts are named event-report*.
//
// Usage: node check_report.mjs --exe PATH --course GPX --dem TIF --out DIR --artefacts DIR
//                              [--mode plain|event]
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

const SKIP = 77;

function parseArgs(argv) {
  const args = {};
  for (let i = 2; i < argv.length; i += 2) {
    if (!argv[i].startsWith('--') || i + 1 >= argv.length) throw new Error(`bad argument ${argv[i]}`);
    args[argv[i].slice(2)] = argv[i + 1];
  }
  for (const key of ['exe', 'course', 'dem', 'out', 'artefacts']) {
    if (!args[key]) throw new Error(`missing --${key}`);
  }
  return args;
}

function findChromium() {
  const candidates = [process.env.CHROMIUM, 'chromium', 'chromium-browser', 'google-chrome'].filter(Boolean);
  for (const name of candidates) {
    if (name.includes('/')) {
      if (fs.existsSync(name)) return name;
      continue;
    }
    for (const dir of (process.env.PATH || '').split(path.delimiter)) {
      const full = path.join(dir, name);
      try {
        fs.accessSync(full, fs.constants.X_OK);
        return full;
      } catch {
        // not here
      }
    }
  }
  return null;
}

// A minimal DevTools protocol client over --remote-debugging-pipe (fd 3: to the browser,
// fd 4: from it; messages are JSON texts ended by a NUL byte).
class Cdp {
  constructor(child) {
    this.out = child.stdio[3];
    this.nextId = 1;
    this.pending = new Map();
    this.listeners = [];
    let buffer = Buffer.alloc(0);
    child.stdio[4].on('data', (chunk) => {
      buffer = Buffer.concat([buffer, chunk]);
      let end;
      while ((end = buffer.indexOf(0)) >= 0) {
        const message = JSON.parse(buffer.subarray(0, end).toString('utf8'));
        buffer = buffer.subarray(end + 1);
        this.dispatch(message);
      }
    });
  }
  dispatch(message) {
    if (message.id !== undefined && this.pending.has(message.id)) {
      const { resolve, reject, method } = this.pending.get(message.id);
      this.pending.delete(message.id);
      if (message.error) reject(new Error(`${method}: ${message.error.message}`));
      else resolve(message.result);
      return;
    }
    for (const listener of this.listeners) listener(message);
  }
  send(method, params = {}, sessionId = undefined) {
    const id = this.nextId++;
    const message = { id, method, params };
    if (sessionId) message.sessionId = sessionId;
    return new Promise((resolve, reject) => {
      this.pending.set(id, { resolve, reject, method });
      this.out.write(JSON.stringify(message) + '\0');
    });
  }
  waitFor(method, sessionId) {
    return new Promise((resolve) => {
      const listener = (m) => {
        if (m.method === method && (!sessionId || m.sessionId === sessionId)) {
          this.listeners = this.listeners.filter((l) => l !== listener);
          resolve(m.params);
        }
      };
      this.listeners.push(listener);
    });
  }
}

// Runs in the page under print media at the width of an A4 page inside its margins: each
// marshal briefing sector starts a new page and is not taller than one.
const printFacts = `(() => JSON.stringify([...document.querySelectorAll('#marshals .sector-page')].map((s) => ({
  id: s.id, breakBefore: getComputedStyle(s).breakBefore, height: s.getBoundingClientRect().height,
}))))()`;

// A small CSV reader for the files beside the report (RFC 4180 quoting).
function parseCsv(text) {
  const rows = [];
  let row = [], field = '', quoted = false;
  for (let i = 0; i < text.length; ++i) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') { field += '"'; ++i; } else if (ch === '"') quoted = false; else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') { row.push(field); field = ''; } else if (ch === '\n') { row.push(field); rows.push(row); row = []; field = ''; } else if (ch !== '\r') field += ch;
  }
  if (field || row.length) { row.push(field); rows.push(row); }
  const [head, ...body] = rows;
  return body.map((r) => Object.fromEntries(head.map((h, k) => [h, r[k]])));
}

// Runs in the page: everything the test asserts about the document.
const pageFacts = `(() => {
  const ids = [...document.querySelectorAll('main > header, main > aside, main > section')].map((e) => e.id);
  const count = (sel) => document.querySelectorAll(sel).length;
  const numbers = (sel) => [...document.querySelectorAll(sel)].map((e) => Number(e.dataset.hazard)).sort((a, b) => a - b);
  const external = [...document.querySelectorAll('[src], [href], [srcset], [data]')]
    .map((e) => e.getAttribute('src') || e.getAttribute('href') || e.getAttribute('srcset') || e.getAttribute('data'))
    .filter((v) => v && !v.startsWith('#') && !v.startsWith('data:'));
  const rowsLinkBack = [...document.querySelectorAll('#hazard-table tbody tr')].every((row) => {
    const id = row.id.replace('hazard-', '');
    return document.getElementById('plan-' + id) && document.getElementById('elev-' + id) &&
      document.getElementById('plan-' + id).closest('a').getAttribute('href') === '#' + row.id;
  });
  const posts = [...document.querySelectorAll('.sector-plan .post-marker')].map((m) => ({
    code: m.dataset.post,
    href: m.closest('a') ? m.closest('a').getAttribute('href') : null,
    row: !!(m.closest('a') && document.querySelector(m.closest('a').getAttribute('href'))),
    back: !!document.querySelector('#post-' + m.dataset.post.toLowerCase() + ' a[href="#' + m.id + '"]'),
    samePage: !!(m.closest('.sector-page') && m.closest('a') &&
      m.closest('.sector-page').contains(document.querySelector(m.closest('a').getAttribute('href')))),
  }));
  const finish = document.querySelector('#schedule-table tr[data-kind="finish"]');
  const hms = (col) => finish?.querySelector('td[data-col="' + col + '"] .t')?.dataset.hms ?? null;
  return JSON.stringify({
    sections: ids,
    posts,
    postRows: [...document.querySelectorAll('table.posts tbody tr')].map((r) => r.dataset.post),
    sectorPages: count('#marshals .sector-page'),
    finish: finish ? { earliest: hms('first'), latest: hms('last'), closing: hms('closing'),
      closureOpen: hms('closed-from'), closureClose: hms('closed-until') } : null,
    cutoffs: [...document.querySelectorAll('#schedule-table td[data-col="cutoff"] .t')].map((t) =>
      [t.closest('tr').dataset.atM, t.dataset.hms]),
    waves: count('#waves tbody tr'),
    verdicts: [...document.querySelectorAll('#grading-table tbody tr')].map((r) => [r.dataset.class, r.dataset.verdict]),
    summaryVerdicts: [...document.querySelectorAll('#class-times tbody tr')].map((r) => [r.dataset.class, r.dataset.verdict]),
    courseGrade: Number(document.getElementById('course-grade')?.dataset.level),
    svgs: count('svg.chart'),
    elevationChart: count('#elevation svg#elevation-chart'),
    planView: count('#plan svg#plan-view'),
    speedCharts: count('#speeds svg.speed-chart:not(.closeup)'),
    elevationMarkers: numbers('#elevation-chart .hazard-marker'),
    planMarkers: numbers('#plan-view .hazard-marker'),
    tableRows: numbers('#hazard-table tbody tr'),
    rowsLinkBack,
    external,
    caution: (document.getElementById('caution') || {}).textContent || '',
    title: document.title,
    width: document.documentElement.scrollWidth,
    height: document.documentElement.scrollHeight,
  });
})()`;

async function main() {
  const args = parseArgs(process.argv);
  const chromium = findChromium();
  if (!chromium) {
    console.log('SKIP: Chromium not found (install the Debian package "chromium", or set CHROMIUM=/path/to/it); ' +
      'the browser test of report.html did not run.');
    process.exit(SKIP);
  }
  fs.mkdirSync(args.artefacts, { recursive: true });

  // 1. The report of the sample course, made by the program itself.
  const eventMode = args.mode === 'event';
  const prefix = eventMode ? 'event-report' : 'report';
  let folder = args.out;
  if (eventMode) {
    fs.rmSync(args.out, { recursive: true, force: true });
    fs.mkdirSync(args.out, { recursive: true });
    const eventFile = path.join(args.out, 'event.toml');
    const init = spawnSync(args.exe, ['init', args.course, '--dem', args.dem, '--output', eventFile], { encoding: 'utf8' });
    if (init.status !== 0) throw new Error(`coursewarden init failed (${init.status}): ${init.stderr}`);
    const checks = path.join(args.out, 'checks');
    const made = spawnSync(args.exe, ['check', eventFile, '--out', checks], { encoding: 'utf8' });
    if (made.status !== 0) throw new Error(`coursewarden check EVENT failed (${made.status}): ${made.stderr}`);
    const first = fs.readdirSync(checks).sort().find((d) => fs.existsSync(path.join(checks, d, 'report.html')));
    if (!first) throw new Error(`no report folder under ${checks}`);
    folder = path.join(checks, first);
  } else {
    const made = spawnSync(args.exe, ['check', args.course, '--dem', args.dem, '--out', args.out], { encoding: 'utf8' });
    if (made.status !== 0) throw new Error(`coursewarden check failed (${made.status}): ${made.stderr}`);
  }
  const reportPath = path.resolve(folder, 'report.html');
  const summary = JSON.parse(fs.readFileSync(path.join(folder, 'summary.json'), 'utf8'));
  const expected = summary.hazards.map((h) => h.number).sort((a, b) => a - b);
  const schedule = parseCsv(fs.readFileSync(path.join(folder, 'schedule.csv'), 'utf8'));
  const plan = parseCsv(fs.readFileSync(path.join(folder, 'marshal-plan.csv'), 'utf8'));

  // 2. Chromium, isolated: its own empty profile, no background traffic of its own.
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'cw-chromium-'));
  const child = spawn(chromium, [
    '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
    '--disable-background-networking', '--disable-component-update', '--disable-sync',
    '--disable-default-apps', '--disable-extensions', '--mute-audio', '--hide-scrollbars',
    '--force-color-profile=srgb', `--user-data-dir=${profile}`, '--remote-debugging-pipe', 'about:blank',
  ], { stdio: ['ignore', 'ignore', 'pipe', 'pipe', 'pipe'] });
  let chromiumLog = '';
  child.stderr.on('data', (d) => { chromiumLog += d.toString(); });
  const failures = [];
  const guard = setTimeout(() => {
    console.error('FAIL: the browser did not answer within 120 s\n' + chromiumLog.slice(-2000));
    child.kill('SIGKILL');
    process.exit(1);
  }, 120000);

  try {
    const cdp = new Cdp(child);
    const { targetInfos } = await cdp.send('Target.getTargets');
    let page = targetInfos.find((t) => t.type === 'page');
    if (!page) {
      const { targetId } = await cdp.send('Target.createTarget', { url: 'about:blank' });
      page = { targetId };
    }
    const { sessionId } = await cdp.send('Target.attachToTarget', { targetId: page.targetId, flatten: true });
    const consoleErrors = [];
    const requests = [];
    cdp.listeners.push((m) => {
      if (m.sessionId !== sessionId) return;
      if (m.method === 'Runtime.consoleAPICalled' && ['error', 'assert'].includes(m.params.type)) {
        consoleErrors.push(`console.${m.params.type}: ${m.params.args.map((a) => a.value ?? a.description).join(' ')}`);
      } else if (m.method === 'Runtime.exceptionThrown') {
        consoleErrors.push(`exception: ${m.params.exceptionDetails.text}`);
      } else if (m.method === 'Log.entryAdded' && m.params.entry.level === 'error') {
        consoleErrors.push(`log: ${m.params.entry.text} ${m.params.entry.url || ''}`);
      } else if (m.method === 'Network.requestWillBeSent') {
        requests.push(m.params.request.url);
      }
    });
    for (const domain of ['Runtime', 'Log', 'Network', 'Page']) await cdp.send(`${domain}.enable`, {}, sessionId);
    await cdp.send('Emulation.setDeviceMetricsOverride',
      { width: 1200, height: 900, deviceScaleFactor: 1, mobile: false }, sessionId);
    const url = pathToFileURL(reportPath).href;
    const loaded = cdp.waitFor('Page.loadEventFired', sessionId);
    await cdp.send('Page.navigate', { url }, sessionId);
    await loaded;
    const { result } = await cdp.send('Runtime.evaluate', { expression: pageFacts, returnByValue: true }, sessionId);
    const facts = JSON.parse(result.value);

    // 3. Checks.
    const wantSections = ['report-header', 'caution', 'summary', 'elevation', 'speeds', 'plan', 'hazards', 'schedule',
      'marshals', 'grading', 'method'];
    if (JSON.stringify(facts.sections) !== JSON.stringify(wantSections)) {
      failures.push(`sections ${JSON.stringify(facts.sections)}, expected ${JSON.stringify(wantSections)}`);
    }
    if (facts.elevationChart !== 1) failures.push(`elevation charts: ${facts.elevationChart}, expected 1`);
    if (facts.planView !== 1) failures.push(`plan views: ${facts.planView}, expected 1`);
    if (facts.speedCharts !== summary.riders.length) {
      failures.push(`speed charts: ${facts.speedCharts}, expected one per class (${summary.riders.length})`);
    }
    if (expected.length === 0) failures.push('the sample course should have hazards (summary.json has none)');
    for (const [name, got] of [['elevation', facts.elevationMarkers], ['plan', facts.planMarkers], ['table', facts.tableRows]]) {
      if (JSON.stringify(got) !== JSON.stringify(expected)) {
        failures.push(`${name} markers ${JSON.stringify(got)}, expected one per hazard ${JSON.stringify(expected)}`);
      }
    }
    if (!facts.rowsLinkBack) failures.push('a hazard row and its markers do not link to each other');
    if (facts.external.length) failures.push(`links to outside the page: ${facts.external.join(', ')}`);
    if (!facts.caution.includes('Local regulations, the road authority and the event')) {
      failures.push('the caution box does not carry the caution');
    }
    if (facts.width > 1200) failures.push(`the page is wider than the window: ${facts.width} px`);
    const outside = requests.filter((r) => r !== url && !r.startsWith('data:'));
    if (outside.length) failures.push(`network requests: ${outside.join(', ')}`);
    if (!requests.includes(url)) failures.push(`the report itself was not seen loading (${requests.join(', ')})`);
    // Marshal briefing: one marker per post (marshal-plan.csv), linked both ways with its row on
    // the same sector page; one page per sector.
    const wantPosts = plan.map((p) => p.post);
    const gotPosts = facts.posts.map((p) => p.code);
    if (wantPosts.length === 0) failures.push('the sample course should have marshal posts (marshal-plan.csv has none)');
    if (JSON.stringify(gotPosts) !== JSON.stringify(wantPosts)) {
      failures.push(`post markers ${JSON.stringify(gotPosts)}, expected one per post ${JSON.stringify(wantPosts)}`);
    }
    if (JSON.stringify(facts.postRows) !== JSON.stringify(wantPosts)) {
      failures.push(`post rows ${JSON.stringify(facts.postRows)}, expected ${JSON.stringify(wantPosts)}`);
    }
    for (const p of facts.posts) {
      if (!p.row || !p.back || !p.samePage) failures.push(`post ${p.code}: marker and row not linked both ways on one page`);
    }
    const sectors = new Set(plan.map((p) => p.sector)).size;
    if (facts.sectorPages !== sectors) failures.push(`sector pages: ${facts.sectorPages}, expected ${sectors}`);
    // Schedule: the finish row shows schedule.csv's times.
    const finishCsv = schedule.find((r) => r.kind === 'finish');
    const wantFinish = finishCsv && { earliest: finishCsv.earliest, latest: finishCsv.latest, closing: finishCsv.closing,
      closureOpen: finishCsv.closure_open, closureClose: finishCsv.closure_close };
    if (JSON.stringify(facts.finish) !== JSON.stringify(wantFinish)) {
      failures.push(`finish row ${JSON.stringify(facts.finish)}, schedule.csv has ${JSON.stringify(wantFinish)}`);
    }
    // Cut-offs: every one of schedule.csv, with its time.
    const wantCutoffs = schedule.filter((r) => r.cutoff !== '').map((r) => [r.at_m, r.cutoff]);
    if (JSON.stringify(facts.cutoffs) !== JSON.stringify(wantCutoffs)) {
      failures.push(`cut-offs ${JSON.stringify(facts.cutoffs)}, schedule.csv has ${JSON.stringify(wantCutoffs)}`);
    }
    if (eventMode && wantCutoffs.length === 0) failures.push('the event file of init should set cut-offs');
    // Waves: the event file's [[start]] tables; without one, a single mass start.
    const wantWaves = eventMode
      ? (fs.readFileSync(path.join(args.out, 'event.toml'), 'utf8').match(/^\[\[start\]\]/gm) || []).length : 1;
    if (facts.waves !== wantWaves) failures.push(`waves: ${facts.waves} rows, expected ${wantWaves}`);
    // Grading: the verdicts of summary.json, in the grading section and in the summary.
    const wantVerdicts = JSON.stringify(summary.grading.classes.map((g) => [g.name, g.verdict]));
    if (JSON.stringify(facts.verdicts) !== wantVerdicts) failures.push(`grading ${JSON.stringify(facts.verdicts)}, summary.json ${wantVerdicts}`);
    if (JSON.stringify(facts.summaryVerdicts) !== wantVerdicts) {
      failures.push(`summary verdicts ${JSON.stringify(facts.summaryVerdicts)}, summary.json ${wantVerdicts}`);
    }
    if (facts.courseGrade !== summary.grading.course.level) {
      failures.push(`course grade ${facts.courseGrade}, summary.json ${summary.grading.course.level}`);
    }
    if (consoleErrors.length) failures.push(`console errors: ${consoleErrors.join(' | ')}`);

    // 4. Artefacts: full page, each section, and an A4 print.
    await cdp.send('Emulation.setDeviceMetricsOverride',
      { width: 1200, height: Math.ceil(facts.height), deviceScaleFactor: 1, mobile: false }, sessionId);
    const shot = await cdp.send('Page.captureScreenshot', { format: 'png', captureBeyondViewport: true }, sessionId);
    fs.writeFileSync(path.join(args.artefacts, `${prefix}.png`), Buffer.from(shot.data, 'base64'));
    const shots = [...wantSections];
    for (let k = 1; k <= facts.sectorPages; ++k) shots.push(`sector-${k}`);
    for (const id of shots) {
      const { result: box } = await cdp.send('Runtime.evaluate', {
        expression: `(() => { const r = document.getElementById(${JSON.stringify(id)})?.getBoundingClientRect();
          return r ? JSON.stringify({x: r.x + scrollX, y: r.y + scrollY, w: r.width, h: r.height}) : null; })()`,
        returnByValue: true,
      }, sessionId);
      if (!box.value) continue;
      const b = JSON.parse(box.value);
      const part = await cdp.send('Page.captureScreenshot', {
        format: 'png', captureBeyondViewport: true,
        clip: { x: Math.max(0, b.x - 8), y: Math.max(0, b.y - 8), width: b.w + 16, height: b.h + 16, scale: 1 },
      }, sessionId);
      fs.writeFileSync(path.join(args.artefacts, `${prefix}-${id}.png`), Buffer.from(part.data, 'base64'));
    }
    // Print layout: A4 less the page margins of the report's @page rule (13 mm top and bottom,
    // 12 mm left and right) at 96 CSS px per inch: 186 mm x 271 mm = 703 x 1024 px.
    await cdp.send('Emulation.setDeviceMetricsOverride', { width: 703, height: 1024, deviceScaleFactor: 1, mobile: false },
      sessionId);
    await cdp.send('Emulation.setEmulatedMedia', { media: 'print' }, sessionId);
    const { result: printed } = await cdp.send('Runtime.evaluate', { expression: printFacts, returnByValue: true }, sessionId);
    for (const page of JSON.parse(printed.value)) {
      if (page.breakBefore !== 'page') failures.push(`${page.id} does not start a new printed page (${page.breakBefore})`);
      if (page.height > 1024) failures.push(`${page.id} is ${Math.round(page.height)} px tall in print, more than one A4 page (1024 px)`);
    }
    await cdp.send('Emulation.setEmulatedMedia', { media: '' }, sessionId);
    await cdp.send('Emulation.clearDeviceMetricsOverride', {}, sessionId);
    const pdf = await cdp.send('Page.printToPDF', { printBackground: true, preferCSSPageSize: true }, sessionId);
    fs.writeFileSync(path.join(args.artefacts, `${prefix}.pdf`), Buffer.from(pdf.data, 'base64'));
    await cdp.send('Browser.close').catch(() => {});

    console.log(`report: ${reportPath}`);
    console.log(`sections: ${facts.sections.join(', ')}; charts: ${facts.svgs}; hazards: ${expected.length}; ` +
      `requests: ${requests.length}; console errors: ${consoleErrors.length}`);
    console.log(`screenshot: ${path.join(args.artefacts, `${prefix}.png`)}`);
  } finally {
    clearTimeout(guard);
    // Let the browser finish writing its profile before it is removed.
    const exited = child.exitCode !== null ? Promise.resolve() : new Promise((resolve) => child.once('exit', resolve));
    child.kill();
    await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 10000))]);
    try {
      fs.rmSync(profile, { recursive: true, force: true, maxRetries: 5, retryDelay: 200 });
    } catch (error) {
      console.log(`note: could not remove the browser profile ${profile}: ${error.message}`);
    }
  }
  if (failures.length) {
    for (const f of failures) console.error(`FAIL: ${f}`);
    process.exit(1);
  }
  console.log('PASS: report.html in headless Chromium');
}

main().catch((error) => {
  console.error(`FAIL: ${error.stack || error}`);
  process.exit(1);
});
