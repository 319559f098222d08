// One line per case and polarity string: every triangle's chosen sequence as
// order/choice/gate changes/level jumps/patterns of s1 s2 s3 (phase a, b, c), or "-" when none.
// Shared by the golden test and by the script that wrote the golden file.
export const SEQUENCE_CASES = [
  { topology: 'npc' },
  { topology: 'npc', faults: ['a.outerUpper'] },
  { topology: 'npc', faults: ['a.innerUpper:short'] },
  { topology: 'anpc', faults: ['a.innerUpper', 'b.clampUpper'] },
  { topology: 'anpc-hybrid', faults: ['a.innerUpper'], levelSteps: 'adjacent' },
  { topology: 'tnpc', faults: ['a.neutralToOut'], levelSteps: 'any' },
  { topology: 'two-level' },
  { topology: 'five-level' },
  { topology: 'five-level', faults: ['a.s2'] },
];

export function sequenceDigest(core, fiveLevelLeg) {
  const lines = [];
  for (const c of SEQUENCE_CASES) {
    const options = { ...c, topology: c.topology === 'five-level' ? fiveLevelLeg : c.topology };
    const table = core.switchingTable(options);
    for (const [p, pol] of Object.entries(table.polarities)) {
      const seqs = pol.tableTriangles.map((t) => {
        const s = t.sequence;
        if (!s) return '-';
        const pats = s.states.map((st) => st.map((x) => x.pattern).join('.')).join(' ');
        return `${s.order.join('')}/${s.choice.join('')}/${s.totalGateChanges}/${s.levelJumps.length}/${pats}`;
      });
      lines.push(`${c.topology}${c.faults ? ` ${c.faults.join(',')}` : ''}${c.levelSteps ? ` ${c.levelSteps}` : ''} ${p}: ${seqs.join('; ')}`);
    }
  }
  return `${lines.join('\n')}\n`;
}
