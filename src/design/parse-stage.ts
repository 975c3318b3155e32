import type { Polarity } from '../table/types.js';
import { checkKeys, isObject, NAME, NAME_RULE, parseRange, requireNumber, requireString, type Fail, type Path } from './parse.js';
import { topologyNames } from '../topology/index.js';
import { INPUT_TOPOLOGIES, type InputTopology, type StageObjective, type StageSideSpec, type StageSpec, type Topology } from './types.js';

const STAGE_KEYS = ['name', 'current', 'gain', 'swing', 'output', 'input', 'load', 'gbw', 'cap', 'objective'];
const INPUT_KEYS = ['device', 'topology', 'l', 'gmid', 'bias'];
const LOAD_KEYS = ['topology', 'l', 'gmid', 'bias'];
const STAGE_OBJECTIVES: StageObjective[] = ['area', 'swing', 'gain'];

/**
 * Validate the `stages:` list. `names` holds the stack names already taken:
 * a stage name must differ from every stack and stage name (results and fronts are keyed by it).
 */
export function parseStages(raw: unknown, supply: number, names: Set<string>, fail: Fail): StageSpec[] {
  if (!Array.isArray(raw) || raw.length === 0) return fail(['stages'], 'expected a non-empty list of stages');
  return raw.map((item, i) => {
    const path: Path = ['stages', i];
    if (!isObject(item)) fail(path, 'expected a mapping with name, current, gain, swing, input, load');
    const s = item as Record<string, unknown>;
    checkKeys(s, STAGE_KEYS, path, fail);
    const stage = parseStage(s, path, supply, fail);
    if (names.has(stage.name)) fail([...path, 'name'], `duplicate name "${stage.name}" (stack and stage names must differ)`);
    names.add(stage.name);
    return stage;
  });
}

function parseStage(s: Record<string, unknown>, path: Path, supply: number, fail: Fail): StageSpec {
  const name = requireString(s, 'name', path, fail);
  // Stage names become file names (per-stage netlists, fronts), as stack names do.
  if (!NAME.test(name)) fail([...path, 'name'], `stage names use ${NAME_RULE}; got ${JSON.stringify(name)}`);
  const current = requireNumber(s, 'current', path, fail, { positive: true });
  const gain = requireNumber(s, 'gain', path, fail, { positive: true });
  if (!(gain > 1)) fail([...path, 'gain'], `expected a gain above 1 (|dVout/dVin|), got ${gain}`);
  const swing = requireNumber(s, 'swing', path, fail, { positive: true });
  if (!(swing < supply)) fail([...path, 'swing'], `swing ${swing} V must be below the supply ${supply} V`);
  const output = s.output === undefined ? supply / 2 : requireNumber(s, 'output', path, fail, { positive: true });
  if (!(output < supply)) fail([...path, 'output'], `output ${output} V must lie between 0 and the supply ${supply} V`);
  const objective = (s.objective === undefined ? 'area' : String(s.objective)) as StageObjective;
  if (!STAGE_OBJECTIVES.includes(objective)) fail([...path, 'objective'], `expected one of ${STAGE_OBJECTIVES.join(', ')}, got "${objective}"`);
  const input = parseInput(s.input, [...path, 'input'], fail);
  const load = parseLoad(s.load, [...path, 'load'], fail);
  const out: StageSpec = { name, current, gain, swing, output, input, load, objective };
  if (s.cap !== undefined) out.cap = requireNumber(s, 'cap', path, fail, { positive: true });
  if (s.gbw !== undefined) {
    out.gbw = requireNumber(s, 'gbw', path, fail, { positive: true });
    if (out.cap === undefined) fail([...path, 'gbw'], 'a gbw target needs the load capacitance `cap`');
  }
  return out;
}

function parseSide(s: Record<string, unknown>, path: Path, fail: Fail): StageSideSpec {
  const out: StageSideSpec = {};
  if (s.l !== undefined) out.l = parseRange(s.l, [...path, 'l'], fail, true, 'm');
  if (s.gmid !== undefined) {
    const g = parseRange(s.gmid, [...path, 'gmid'], fail, false, '1/V');
    out.gmid = { min: g.min, max: g.max };
  }
  if (s.bias !== undefined) out.biasCurrent = requireNumber(s, 'bias', path, fail, { positive: true });
  return out;
}

function parseInput(raw: unknown, path: Path, fail: Fail): StageSpec['input'] {
  if (raw === undefined) return fail(path, 'required key is missing (e.g. {device: n, topology: cascode})');
  if (!isObject(raw)) return fail(path, 'expected a mapping with device and topology');
  checkKeys(raw, INPUT_KEYS, path, fail);
  const device = requireString(raw, 'device', path, fail) as Polarity;
  if (device !== 'n' && device !== 'p') fail([...path, 'device'], `expected n (input device to ground) or p (from the supply), got "${device}"`);
  const topology = (raw.topology === undefined ? 'single' : String(raw.topology)) as InputTopology;
  if (!INPUT_TOPOLOGIES.includes(topology)) fail([...path, 'topology'], `expected one of ${INPUT_TOPOLOGIES.join(', ')}, got "${topology}"`);
  return { device, topology, ...parseSide(raw, path, fail) };
}

function parseLoad(raw: unknown, path: Path, fail: Fail): StageSpec['load'] {
  const r = raw === undefined ? {} : raw;
  if (!isObject(r)) return fail(path, 'expected a mapping such as {topology: auto}');
  checkKeys(r, LOAD_KEYS, path, fail);
  const topology = (r.topology === undefined ? 'auto' : String(r.topology)) as Topology | 'auto';
  if (topology !== 'auto' && !topologyNames().includes(topology)) {
    fail([...path, 'topology'], `expected one of ${[...topologyNames(), 'auto'].join(', ')}, got "${topology}"`);
  }
  return { topology, ...parseSide(r, path, fail) };
}
