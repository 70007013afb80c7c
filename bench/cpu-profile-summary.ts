// Summarises a V8 .cpuprofile: self time per function and per package/file, heaviest first.
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
console.log(`total sampled ${(total / 1000).toFixed(0)} ms`);
print('self time by package / file', perPlace);
print('self time by function', perFunction);
