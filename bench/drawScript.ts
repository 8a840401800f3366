/**
 * The same plate as a native OpenCASCADE DRAW (Tcl) script, modelled the way a CAD user's part
 * would be: the chamfered blank (ruled through the outline wires — the cheapest native route to
 * the same edge chamfer), then boolean cuts: all through holes, the counterbores, the blind
 * holes, the pockets. Used only as the benchmark's baseline.
 */
import type { OutlineSegment, PlateProfile } from '../src/domain/profileTypes';
import { angleOfRad, arcSweepRad } from '../src/domain/exports/outlineMath';
import { offsetOutlineInward } from '../src/cad/offsetOutline';

function num(v: number): string {
  return Number.isInteger(v) ? String(v) : v.toPrecision(17);
}

export function drawPlateScript(profile: PlateProfile, iterations: number, warmups: number): string {
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  const out: string[] = ['pload MODELING', 'proc buildplate {} {', '  global plate'];
  let n = 0;
  const wire = (chain: readonly OutlineSegment[], z: number): string => {
    const edges: string[] = [];
    for (const s of chain) {
      const e = `e${++n}`;
      if (s.kind === 'line') {
        out.push(`  vertex va${n} ${num(s.start.x)} ${num(s.start.y)} ${num(z)}`, `  vertex vb${n} ${num(s.end.x)} ${num(s.end.y)} ${num(z)}`);
        out.push(`  edge ${e} va${n} vb${n}`);
      } else {
        const a0 = angleOfRad(s.center, s.start);
        const sw = arcSweepRad(s);
        const nz = s.ccw ? 1 : -1;
        const u0 = s.ccw ? a0 : -a0;
        out.push(`  circle c${n} ${num(s.center.x)} ${num(s.center.y)} ${num(z)} 0 0 ${nz} 1 0 0 ${num(s.radiusMm)}`);
        out.push(`  mkedge ${e} c${n} ${num(u0)} ${num(u0 + Math.abs(sw))}`);
      }
      edges.push(e);
    }
    const w = `w${++n}`;
    out.push(`  wire ${w} ${edges.join(' ')}`);
    return w;
  };
  if (c > 0) {
    const inset = offsetOutlineInward(profile.outline, c);
    const ws = [wire(inset, 0), wire(profile.outline, c), wire(profile.outline, t - c), wire(inset, t)];
    out.push(`  thrusections blank 1 1 ${ws.join(' ')}`);
  } else {
    const w = wire(profile.outline, 0);
    out.push(`  mkplane fb ${w}`, `  prism blank fb 0 0 ${num(t)}`);
  }
  // tools, grouped the way features are: through holes, counterbores, blind holes, pockets
  const groups: Record<string, string[]> = { through: [], cbore: [], blind: [], pocket: [] };
  let k = 0;
  for (const h of profile.holes) {
    const r = h.diameterMm / 2;
    if (h.depthMm === null) {
      out.push(`  pcylinder h${++k} ${num(r)} ${num(t + 2)}`, `  ttranslate h${k} ${num(h.center.x)} ${num(h.center.y)} -1`);
      groups.through!.push(`h${k}`);
    } else {
      const z0 = h.fromSide === 'engine' ? -1 : t - h.depthMm;
      out.push(`  pcylinder h${++k} ${num(r)} ${num(h.depthMm + 1)}`, `  ttranslate h${k} ${num(h.center.x)} ${num(h.center.y)} ${num(z0)}`);
      groups.blind!.push(`h${k}`);
    }
    if (h.counterbore) {
      const cb = h.counterbore;
      const z0 = cb.fromSide === 'engine' ? -1 : t - cb.depthMm;
      out.push(`  pcylinder h${++k} ${num(cb.diameterMm / 2)} ${num(cb.depthMm + 1)}`, `  ttranslate h${k} ${num(h.center.x)} ${num(h.center.y)} ${num(z0)}`);
      groups.cbore!.push(`h${k}`);
    }
  }
  for (const p of profile.pockets) {
    const z0 = p.fromSide === 'engine' ? -1 : t - p.depthMm;
    const w = wire(p.outline, z0);
    out.push(`  mkplane fp${++k} ${w}`, `  prism h${k} fp${k} 0 0 ${num(p.depthMm + 1)}`);
    groups.pocket!.push(`h${k}`);
  }
  let cur = 'blank';
  const used = Object.entries(groups).filter(([, tools]) => tools.length > 0);
  used.forEach(([name, tools], i) => {
    out.push(`  compound ${tools.join(' ')} tools_${name}`);
    const next = i === used.length - 1 ? 'plate' : `r${i + 1}`;
    out.push(`  bcut ${next} ${cur} tools_${name}`);
    cur = next;
  });
  out.push('}');
  out.push(`for {set i 0} {$i < ${warmups}} {incr i} { buildplate }`);
  out.push('dchrono cpu reset', 'dchrono cpu start');
  out.push(`for {set i 0} {$i < ${iterations}} {incr i} {`);
  out.push('  set t0 [clock microseconds]', '  buildplate', '  set t1 [clock microseconds]', '  puts "PWTIME [expr {$t1 - $t0}]"', '}');
  // CPU time of all timed builds (10 ms resolution, so only the total is meaningful)
  out.push('dchrono cpu stop', 'puts "PWCPU [dchrono cpu show]"');
  out.push('puts "PWPROPS [vprops plate]"', 'checkshape plate', 'exit');
  return out.join('\n');
}
