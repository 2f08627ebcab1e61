import { builtInTrees } from './src/engine/diagnosis';
import { oomCases } from './test/support/out-of-model/cases';
import { runOomCase } from './test/support/out-of-model/drive';
(async () => {
  const tree = builtInTrees()['three-wire-5v']!;
  for (const c of oomCases('three-wire-5v', 12, 31)) {
    const run = await runOomCase(tree, c);
    if (run.verdict !== 'confidently_wrong' && !(c.cause === 'sensor_internal')) continue;
    const s = (c.circuit as any).sensor;
    console.log(c.cause, c.variant, '->', run.verdict, run.proven, s.kind, (s.position ?? s.ratio).toFixed(2), run.taken.map((r) => `${r.request.at}/${r.request.engine}/${r.request.sensorInput ?? ''}=${typeof r.value === 'number' ? r.value.toFixed(2) : r.value}`).join(' '));
  }
})();
