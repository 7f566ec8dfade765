// Load a report in headless Chromium with the network off and check it as a
// browser sees it. Talks the DevTools protocol over a pipe (no npm package).
//
//   node browser_check.mjs REPORT.html OUTDIR
//
// Writes OUTDIR/report.png (full-page screenshot), OUTDIR/report-a4.pdf and
// OUTDIR/report-letter.pdf. Exits 1 when the page logged a console error,
// threw, requested anything that is not the file itself or a data: URL, or a
// load failed; 3 when the browser could not be driven; 0 otherwise.
// The browser binary is taken from $RIDGECAL_CHROMIUM, else `chromium` on PATH.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

// An optional third argument, a CSS selector, also writes OUTDIR/element.png,
// a screenshot of the first element it matches (a problem when none does).
const [reportArg, outDir, elementSelector] = process.argv.slice(2);
if (!reportArg || !outDir) {
  console.error('usage: node browser_check.mjs REPORT.html OUTDIR');
  process.exit(2);
}
const reportUrl = pathToFileURL(path.resolve(reportArg)).href;
fs.mkdirSync(outDir, { recursive: true });
const userDir = fs.mkdtempSync(path.join(os.tmpdir(), 'ridgecal-chromium-'));
const browser = process.env.RIDGECAL_CHROMIUM || 'chromium';
const args = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync',
  '--disable-default-apps', '--disable-extensions', '--mute-audio', '--hide-scrollbars',
  `--user-data-dir=${userDir}`, '--remote-debugging-pipe',
  // Belt and braces with the offline emulation below: no name resolves.
  '--host-resolver-rules=MAP * ~NOTFOUND', '--proxy-server=127.0.0.1:9', '--proxy-bypass-list=<-loopback>',
  '--window-size=860,1200', '--force-device-scale-factor=1', 'about:blank',
];
// Own process group, so that the browser's helper processes can be ended together.
const child = spawn(browser, args, { stdio: ['ignore', 'ignore', 'pipe', 'pipe', 'pipe'], detached: true });
const exited = new Promise((resolve) => child.on('exit', resolve));
let browserLog = '';
child.stderr.on('data', (d) => { browserLog += d.toString(); });

const problems = [];
let nextId = 1;
const pending = new Map();
const listeners = [];
let buffer = Buffer.alloc(0);
child.stdio[4].on('data', (chunk) => {
  buffer = Buffer.concat([buffer, chunk]);
  let end;
  while ((end = buffer.indexOf(0)) >= 0) {
    const msg = JSON.parse(buffer.subarray(0, end).toString('utf8'));
    buffer = buffer.subarray(end + 1);
    if (msg.id && pending.has(msg.id)) {
      const { resolve, reject, method } = pending.get(msg.id);
      pending.delete(msg.id);
      if (msg.error) reject(new Error(`${method}: ${msg.error.message}`));
      else resolve(msg.result);
    } else if (msg.method) {
      for (const l of listeners) l(msg);
    }
  }
});
function send(method, params = {}, sessionId = undefined) {
  const id = nextId++;
  const msg = { id, method, params };
  if (sessionId) msg.sessionId = sessionId;
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject, method });
    child.stdio[3].write(JSON.stringify(msg) + '\0');
  });
}
function waitFor(method, ms) {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`timed out waiting for ${method}`)), ms);
    listeners.push((m) => { if (m.method === method) { clearTimeout(timer); resolve(m); } });
  });
}
const sleep = (ms) => new Promise((r) => setTimeout(r, ms));
// Requests sent and not yet finished or failed (by Network requestId).
const inFlight = new Set();
const allowed = (u) => u === reportUrl || u.startsWith('data:') || u.startsWith('about:');

listeners.push((m) => {
  const p = m.params || {};
  switch (m.method) {
    case 'Runtime.exceptionThrown':
      problems.push(`uncaught exception: ${p.exceptionDetails?.exception?.description || p.exceptionDetails?.text}`);
      break;
    case 'Runtime.consoleAPICalled':
      if (p.type === 'error' || p.type === 'assert')
        problems.push(`console.${p.type}: ${(p.args || []).map((a) => a.value ?? a.description).join(' ')}`);
      break;
    case 'Log.entryAdded':
      if (p.entry?.level === 'error') problems.push(`console error: ${p.entry.text} ${p.entry.url || ''}`.trim());
      break;
    case 'Network.requestWillBeSent':
      inFlight.add(p.requestId);
      if (!allowed(p.request?.url)) problems.push(`resource request: ${p.request.url}`);
      break;
    case 'Network.loadingFinished':
      inFlight.delete(p.requestId);
      break;
    case 'Network.loadingFailed':
      inFlight.delete(p.requestId);
      problems.push(`failed load: ${p.errorText} (${p.type || 'resource'})`);
      break;
    default:
      break;
  }
});

// Waits until the page has settled, instead of a fixed delay: the document is
// complete, the page has run one animation frame and the task queued after it
// (so scripts started by the load have run and their console messages, which
// the protocol delivers in order, have arrived before the reply), and no
// request is still in flight (each ended in loadingFinished or loadingFailed).
// Gives up after SETTLE_MS with a problem naming what was still pending.
const SETTLE_MS = 15000;
async function settled(s) {
  const deadline = Date.now() + SETTLE_MS;
  for (;;) {
    const r = await s('Runtime.evaluate', {
      expression: `new Promise((done) => requestAnimationFrame(() => setTimeout(() => done(document.readyState), 0)))`,
      awaitPromise: true, returnByValue: true,
    });
    if (r.result?.value === 'complete' && inFlight.size === 0) return;
    if (Date.now() > deadline) {
      problems.push(`page did not settle within ${SETTLE_MS} ms: readyState ${r.result?.value}, ${inFlight.size} request(s) in flight`);
      return;
    }
    // Wake on the next network event, or poll again after a short while.
    await Promise.race([
      new Promise((resolve) => listeners.push((m) => { if (m.method?.startsWith('Network.loading')) resolve(); })),
      sleep(50),
    ]);
  }
}

async function main() {
  const { targetId } = await send('Target.createTarget', { url: 'about:blank' });
  const { sessionId } = await send('Target.attachToTarget', { targetId, flatten: true });
  const s = (method, params) => send(method, params, sessionId);
  await s('Page.enable');
  await s('Runtime.enable');
  await s('Log.enable');
  await s('Network.enable');
  await s('Network.emulateNetworkConditions', { offline: true, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
  await s('Emulation.setDeviceMetricsOverride', { width: 860, height: 1200, deviceScaleFactor: 1, mobile: false });
  const loaded = waitFor('Page.loadEventFired', 30000);
  const nav = await s('Page.navigate', { url: reportUrl });
  if (nav.errorText) problems.push(`navigation failed: ${nav.errorText}`);
  await loaded;
  await settled(s);
  const metrics = await s('Page.getLayoutMetrics');
  const size = metrics.cssContentSize || metrics.contentSize;
  const shot = await s('Page.captureScreenshot', {
    format: 'png', captureBeyondViewport: true,
    clip: { x: 0, y: 0, width: Math.ceil(size.width), height: Math.ceil(size.height), scale: 1 },
  });
  fs.writeFileSync(path.join(outDir, 'report.png'), Buffer.from(shot.data, 'base64'));
  if (elementSelector) {
    const r = await s('Runtime.evaluate', {
      expression: `(() => { const e = document.querySelector(${JSON.stringify(elementSelector)});
        if (!e) return null; const b = e.getBoundingClientRect();
        return { x: b.left + window.scrollX, y: b.top + window.scrollY, width: b.width, height: b.height }; })()`,
      returnByValue: true,
    });
    const box = r.result?.value;
    if (!box || !(box.width > 0 && box.height > 0)) {
      problems.push(`no visible element matches ${elementSelector}`);
    } else {
      const el = await s('Page.captureScreenshot', {
        format: 'png', captureBeyondViewport: true,
        clip: { x: Math.floor(box.x), y: Math.floor(box.y), width: Math.ceil(box.width), height: Math.ceil(box.height), scale: 1 },
      });
      fs.writeFileSync(path.join(outDir, 'element.png'), Buffer.from(el.data, 'base64'));
      console.log(`element ${elementSelector}: ${Math.ceil(box.width)}x${Math.ceil(box.height)} px -> ${path.join(outDir, 'element.png')}`);
    }
  }
  for (const [name, w, h] of [['a4', 8.27, 11.69], ['letter', 8.5, 11]]) {
    const pdf = await s('Page.printToPDF', {
      paperWidth: w, paperHeight: h, printBackground: true, displayHeaderFooter: false, preferCSSPageSize: false,
      marginTop: 0, marginBottom: 0, marginLeft: 0, marginRight: 0,
    });
    fs.writeFileSync(path.join(outDir, `report-${name}.pdf`), Buffer.from(pdf.data, 'base64'));
  }
  console.log(`screenshot ${Math.ceil(size.width)}x${Math.ceil(size.height)} px -> ${path.join(outDir, 'report.png')}`);
}

const watchdog = setTimeout(() => { console.error('browser_check: overall timeout'); finish(3); }, 90000);
let finished = false;
async function finish(code) {
  if (finished) return;
  finished = true;
  clearTimeout(watchdog);
  try { await Promise.race([send('Browser.close'), sleep(3000)]); } catch { /* already gone */ }
  await Promise.race([exited, sleep(5000)]);
  try { process.kill(-child.pid, 'SIGKILL'); } catch { /* group already gone */ }
  await sleep(100);
  try {
    fs.rmSync(userDir, { recursive: true, force: true, maxRetries: 5, retryDelay: 100 });
  } catch (e) {
    console.error(`browser_check: note: could not remove the temporary profile ${userDir}: ${e.code}`);
  }
  process.exit(code);
}
child.on('error', (e) => { console.error(`browser_check: cannot start ${browser}: ${e.message}`); finish(3); });
main().then(() => {
  if (problems.length) {
    console.error(`browser_check: ${problems.length} problem(s) loading ${reportArg}:`);
    for (const p of problems) console.error(`  - ${p}`);
    finish(1);
  } else {
    console.log('browser_check: no console errors, no resource requests, no failed loads');
    finish(0);
  }
}).catch((e) => {
  console.error(`browser_check: ${e.message}`);
  if (browserLog) console.error(browserLog.split('\n').slice(-15).join('\n'));
  finish(3);
});
