/**
 * Collaboration benchmark (`npm run bench:collab`, after `next build`): our server (signed-in
 * sockets, access checks, every update committed to PGlite before it is passed on) against a plain
 * y-websocket server (no sign-in, nothing stored), both started here and measured the same way
 * on loopback in the same run:
 *   - edit-to-peer latency, p50 / p99 over 500 edits;
 *   - fan-out: one edit until all of 50 read-only clients have it (p50 / p99 over 100 edits);
 *   - a fresh client loading a 1 MB document (median of 7; ours also from the database, cold);
 *   - throughput: 10 writers x 200 small inserts, updates per second until every client converged.
 * Reports figures and ratios; asserts nothing.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import * as Y from 'yjs';
import { demoSessions, repoRoot, startServer, type StartedServer } from '../helpers';
import { connectClient, type CollabClient } from '../integration/collabClients';

const LATENCY_EDITS = 500;
const FAN_OUT_CLIENTS = 50;
const FAN_OUT_EDITS = 100;
const LOAD_RUNS = 7;
const WRITERS = 10;
const INSERTS_EACH = 200;

interface Target {
  name: string;
  url: string;
  /** A fresh document to measure on. */
  newDocument(title: string): Promise<string>;
  writerCookie(i: number): string | undefined;
  readerCookie(): string | undefined;
}

interface Figures {
  latencyP50: number;
  latencyP99: number;
  fanOutP50: number;
  fanOutP99: number;
  loadMedian: number;
  loadColdMedian?: number;
  throughput: number;
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const turn = () => new Promise((resolve) => setImmediate(resolve));

function quantile(values: number[], q: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))]!;
}

function line(doc: Y.Doc): Y.XmlText {
  const body = doc.getXmlFragment('body');
  if (body.length === 0) {
    const paragraph = new Y.XmlElement('paragraph');
    paragraph.insert(0, [new Y.XmlText('')]);
    body.insert(0, [paragraph]);
  }
  return (body.get(0) as Y.XmlElement).get(0) as Y.XmlText;
}

async function connected(target: Target, documentId: string, cookie: string | undefined): Promise<CollabClient> {
  const client = connectClient(target.url, documentId, { cookie });
  await client.synced(60_000);
  return client;
}

/** Resolves when the check passes after one of the doc's updates (or now). */
function whenDoc(doc: Y.Doc, check: () => boolean): Promise<number> {
  if (check()) return Promise.resolve(performance.now());
  return new Promise((resolve) => {
    const onUpdate = () => {
      if (!check()) return;
      doc.off('update', onUpdate);
      resolve(performance.now());
    };
    doc.on('update', onUpdate);
  });
}

async function latency(target: Target): Promise<[number, number]> {
  const id = await target.newDocument('latency');
  const a = await connected(target, id, target.writerCookie(0));
  const b = await connected(target, id, target.writerCookie(1));
  const text = line(a.doc);
  await whenDoc(b.doc, () => b.doc.getXmlFragment('body').length === 1);
  const seen = () => ((b.doc.getXmlFragment('body').get(0) as Y.XmlElement | undefined)?.get(0) as Y.XmlText | undefined)?.length ?? 0;
  const samples: number[] = [];
  for (let i = 0; i < LATENCY_EDITS + 20; i++) {
    const expected = text.length + 1;
    const arrived = whenDoc(b.doc, () => seen() >= expected);
    const started = performance.now();
    text.insert(text.length, 'x');
    const at = await arrived;
    if (i >= 20) samples.push(at - started); // the first 20 warm up
    await pause(1);
  }
  a.destroy();
  b.destroy();
  return [quantile(samples, 0.5), quantile(samples, 0.99)];
}

async function fanOut(target: Target): Promise<[number, number]> {
  const id = await target.newDocument('fan-out');
  const writer = await connected(target, id, target.writerCookie(0));
  const readers = await Promise.all(Array.from({ length: FAN_OUT_CLIENTS }, () => connected(target, id, target.readerCookie())));
  const text = line(writer.doc);
  const lengthIn = (doc: Y.Doc) => ((doc.getXmlFragment('body').get(0) as Y.XmlElement | undefined)?.get(0) as Y.XmlText | undefined)?.length ?? 0;
  await Promise.all(readers.map((r) => whenDoc(r.doc, () => r.doc.getXmlFragment('body').length === 1)));
  const samples: number[] = [];
  for (let i = 0; i < FAN_OUT_EDITS + 10; i++) {
    const expected = text.length + 1;
    const all = Promise.all(readers.map((r) => whenDoc(r.doc, () => lengthIn(r.doc) >= expected)));
    const started = performance.now();
    text.insert(text.length, 'y');
    const times = await all;
    if (i >= 10) samples.push(Math.max(...times) - started);
    await pause(2);
  }
  writer.destroy();
  for (const r of readers) r.destroy();
  return [quantile(samples, 0.5), quantile(samples, 0.99)];
}

/** A document of about 1 MB: 1,000 paragraphs of 1,000 characters. */
function fillMegabyte(doc: Y.Doc): void {
  const body = doc.getXmlFragment('body');
  const words = 'the flow of the coupling towards the fixed point in four dimensions picks up a logarithm ';
  doc.transact(() => {
    for (let i = 0; i < 1000; i++) {
      const paragraph = new Y.XmlElement('paragraph');
      paragraph.setAttribute('stepId', `step-${i}`);
      paragraph.insert(0, [new Y.XmlText(words.repeat(12).slice(0, 1000))]);
      body.push([paragraph]);
    }
  });
}

async function load(target: Target, cold: { wait: number } | null): Promise<{ warm: number; cold?: number }> {
  const id = await target.newDocument('one megabyte');
  const writer = await connected(target, id, target.writerCookie(0));
  fillMegabyte(writer.doc);
  const size = Y.encodeStateAsUpdate(writer.doc).length;
  const check = await connected(target, id, target.writerCookie(1));
  await whenDoc(check.doc, () => check.doc.getXmlFragment('body').length === 1000);
  const timeLoad = async () => {
    const started = performance.now();
    const fresh = connectClient(target.url, id, { cookie: target.readerCookie() });
    await fresh.synced(60_000);
    const took = performance.now() - started;
    if (fresh.doc.getXmlFragment('body').length !== 1000) throw new Error('The loaded document is incomplete.');
    fresh.destroy();
    return took;
  };
  const warm: number[] = [];
  for (let i = 0; i < LOAD_RUNS; i++) warm.push(await timeLoad());
  writer.destroy();
  check.destroy();
  let coldMedian: number | undefined;
  if (cold) {
    const samples: number[] = [];
    for (let i = 0; i < 3; i++) {
      await pause(cold.wait); // every client gone: the room is compacted and leaves memory
      samples.push(await timeLoad());
    }
    coldMedian = quantile(samples, 0.5);
  }
  console.log(`  ${target.name}: document of ${(size / 1024 / 1024).toFixed(2)} MB encoded`);
  return { warm: quantile(warm, 0.5), cold: coldMedian };
}

async function throughput(target: Target): Promise<number> {
  const id = await target.newDocument('throughput');
  const writers = await Promise.all(Array.from({ length: WRITERS }, (_, i) => connected(target, id, target.writerCookie(i))));
  line(writers[0]!.doc);
  await Promise.all(writers.map((w) => whenDoc(w.doc, () => w.doc.getXmlFragment('body').length === 1)));
  const total = WRITERS * INSERTS_EACH;
  const lengthIn = (doc: Y.Doc) => ((doc.getXmlFragment('body').get(0) as Y.XmlElement).get(0) as Y.XmlText).length;
  const done = Promise.all(writers.map((w) => whenDoc(w.doc, () => lengthIn(w.doc) >= total)));
  const started = performance.now();
  await Promise.all(
    writers.map(async (w) => {
      const text = line(w.doc);
      for (let i = 0; i < INSERTS_EACH; i++) {
        text.insert(Math.floor(Math.random() * (text.length + 1)), 'z');
        await turn();
      }
    }),
  );
  const finished = Math.max(...(await done));
  const contents = new Set(writers.map((w) => lengthIn(w.doc) + ':' + line(w.doc).toString()));
  if (contents.size !== 1) throw new Error('The writers did not converge.');
  for (const w of writers) w.destroy();
  return total / ((finished - started) / 1000);
}

async function measure(target: Target, cold: { wait: number } | null): Promise<Figures> {
  console.log(`Measuring ${target.name}…`);
  const [latencyP50, latencyP99] = await latency(target);
  const [fanOutP50, fanOutP99] = await fanOut(target);
  const loaded = await load(target, cold);
  const rate = await throughput(target);
  return { latencyP50, latencyP99, fanOutP50, fanOutP99, loadMedian: loaded.warm, loadColdMedian: loaded.cold, throughput: rate };
}

function startPlain(): Promise<{ url: string; child: ChildProcess }> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'tests/bench/collabPlainServer.ts'], { cwd: repoRoot, stdio: ['ignore', 'pipe', 'inherit'] });
  return new Promise((resolve, reject) => {
    let output = '';
    child.stdout!.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      const match = /listening on (http:\/\/\S+)/.exec(output);
      if (match) resolve({ url: match[1]!, child });
    });
    child.once('exit', (code) => reject(new Error(`The plain server exited with ${code}.`)));
  });
}

const ms = (value: number) => `${value.toFixed(2)} ms`;

async function main(): Promise<void> {
  const dataDir = await mkdtemp(path.join(tmpdir(), 'marginalia-collab-bench-'));
  let ours: StartedServer | null = null;
  let plain: { url: string; child: ChildProcess } | null = null;
  try {
    const idleMs = 300;
    ours = await startServer({ demo: true, dataDir, env: { MARGINALIA_COLLAB_IDLE_MS: String(idleMs) } });
    const demo = await demoSessions(ours.url);
    plain = await startPlain();
    let counter = 0;
    const plainTarget: Target = {
      name: 'plain y-websocket server',
      url: plain.url,
      newDocument: async (title) => `${title.replace(/\s+/g, '-')}-${counter++}`,
      writerCookie: () => undefined,
      readerCookie: () => undefined,
    };
    const ourTarget: Target = {
      name: 'Marginalia',
      url: ours.url,
      newDocument: async (title) => {
        const created = await demo.as.lead.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: `${title} ${counter++}` });
        if (created.status !== 201) throw new Error(`Creating a derivation answered ${created.status}.`);
        return created.body.id;
      },
      writerCookie: (i) => (i % 2 === 0 ? demo.cookies.author : demo.cookies.lead),
      readerCookie: () => demo.cookies.reader,
    };

    const base = await measure(plainTarget, null);
    const mine = await measure(ourTarget, { wait: idleMs + 1_500 });

    const rows: [string, string, string, string][] = [
      ['edit to peer, p50', ms(base.latencyP50), ms(mine.latencyP50), (mine.latencyP50 / base.latencyP50).toFixed(2)],
      ['edit to peer, p99', ms(base.latencyP99), ms(mine.latencyP99), (mine.latencyP99 / base.latencyP99).toFixed(2)],
      [`fan-out to ${FAN_OUT_CLIENTS} readers, p50`, ms(base.fanOutP50), ms(mine.fanOutP50), (mine.fanOutP50 / base.fanOutP50).toFixed(2)],
      [`fan-out to ${FAN_OUT_CLIENTS} readers, p99`, ms(base.fanOutP99), ms(mine.fanOutP99), (mine.fanOutP99 / base.fanOutP99).toFixed(2)],
      ['1 MB document load, median', ms(base.loadMedian), ms(mine.loadMedian), (mine.loadMedian / base.loadMedian).toFixed(2)],
      ['1 MB load from the database, median', '—', mine.loadColdMedian === undefined ? '—' : ms(mine.loadColdMedian), '—'],
      [`throughput, ${WRITERS} writers x ${INSERTS_EACH}`, `${base.throughput.toFixed(0)} /s`, `${mine.throughput.toFixed(0)} /s`, (mine.throughput / base.throughput).toFixed(2)],
    ];
    const widths = [0, 1, 2, 3].map((c) => Math.max(...rows.map((r) => r[c]!.length), ['measure', 'plain', 'Marginalia', 'ratio'][c]!.length));
    const format = (r: string[]) => r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('   ');
    console.log('');
    console.log(format(['measure', 'plain', 'Marginalia', 'ratio']));
    for (const row of rows) console.log(format(row));
    console.log('');
    console.log(`Goals: p50 within 2x of plain (${(mine.latencyP50 / base.latencyP50).toFixed(2)}x), p99 under 25 ms (${ms(mine.latencyP99)}), throughput at least plain's (${(mine.throughput / base.throughput).toFixed(2)}x).`);
  } finally {
    plain?.child.kill('SIGTERM');
    await ours?.stop();
    await rm(dataDir, { recursive: true, force: true });
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
