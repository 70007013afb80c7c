// Summarises a V8 .cpuprofile: self time per function and per package/file, heaviest first, then
// inclusive time (the function and everything it called) per function, idle excluded.
//   npx tsx bench/cpu-profile-summary.ts <file.cpuprofile> [top=30]
import { readFileSync } from 'node:fs';

type Node = { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; children?: number[] };
type Profile = { nodes: Node[]; samples: number[]; timeDeltas: number[] };

const [file, topArg] = process.argv.slice(2);
if (!file) {
  console.error('usage: tsx bench/cpu-profile-summary.ts <file.cpuprofile> [top]');
  process.exit(2);
}
const top = Number(topArg ?? 30);
const profile = JSON.parse(readFileSync(file, 'utf8')) as Profile;
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
const selfUs = new Map<number, number>();
profile.samples.forEach((id, i) => selfUs.set(id, (selfUs.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
const total = [...selfUs.values()].reduce((a, b) => a + b, 0);

function where(url: string): string {
  if (!url) return '(native)';
  const nm = url.lastIndexOf('node_modules/');
  if (nm >= 0) {
    const rest = url.slice(nm + 'node_modules/'.length).split('/');
    return rest[0].startsWith('@') ? `${rest[0]}/${rest[1]}` : rest[0];
  }
  return url.replace(/^file:\/\//, '').replace(process.cwd() + '/', '');
}

const perFunction = new Map<string, number>();
const perPlace = new Map<string, number>();
for (const [id, us] of selfUs) {
  const n = byId.get(id)!;
  const place = where(n.callFrame.url);
  const fn = `${n.callFrame.functionName || '(anonymous)'}  ${place}:${n.callFrame.lineNumber + 1}`;
  perFunction.set(fn, (perFunction.get(fn) ?? 0) + us);
  perPlace.set(place, (perPlace.get(place) ?? 0) + us);
}
const print = (title: string, m: Map<string, number>) => {
  console.log(`\n${title}`);
  for (const [k, us] of [...m].sort((a, b) => b[1] - a[1]).slice(0, top))
    console.log(`${((100 * us) / total).toFixed(1).padStart(5)} %  ${(us / 1000).toFixed(0).padStart(7)} ms  ${k}`);
};
// Inclusive: each sample counts once for every distinct function on its stack.
const parent = new Map<number, number>();
for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
const label = (n: Node) => `${n.callFrame.functionName || '(anonymous)'}  ${where(n.callFrame.url)}:${n.callFrame.lineNumber + 1}`;
const inclusive = new Map<string, number>();
let busy = 0;
profile.samples.forEach((id, i) => {
  const us = profile.timeDeltas[i] ?? 0;
  if (byId.get(id)?.callFrame.functionName === '(idle)') return;
  busy += us;
  const seen = new Set<string>();
  for (let at: number | undefined = id; at !== undefined; at = parent.get(at)) {
    const n = byId.get(at)!;
    if (n.callFrame.functionName === '(root)') continue;
    seen.add(label(n));
  }
  for (const k of seen) inclusive.set(k, (inclusive.get(k) ?? 0) + us);
});

console.log(`total sampled ${(total / 1000).toFixed(0)} ms, not idle ${(busy / 1000).toFixed(0)} ms`);
print('self time by package / file', perPlace);
print('self time by function', perFunction);
console.log(`\ninclusive time by function (share of the not-idle time)`);
for (const [k, us] of [...inclusive].sort((a, b) => b[1] - a[1]).slice(0, top))
  console.log(`${((100 * us) / busy).toFixed(1).padStart(5)} %  ${(us / 1000).toFixed(0).padStart(7)} ms  ${k}`);
