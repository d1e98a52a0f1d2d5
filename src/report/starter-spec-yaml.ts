import YAML, { isMap, isSeq, type Document, type YAMLMap, type YAMLSeq } from 'yaml';
import { defaultSmoothingSpec } from '../sweep/default-spec.js';
import type { LookFolderFacts } from './read-look-folder.js';

/** First line of every spec `boldsweep spec` writes; `--force` replaces only a file that starts with it. */
export const STARTER_SPEC_HEADER = '# boldsweep sweep spec';

function pairOf(map: YAMLMap, key: string) {
  return map.items.find((p) => (p.key as { value?: unknown }).value === key);
}

/** Put a comment above the key at `path` (keys of maps, numbers for sequence items). */
function note(doc: Document, path: Array<string | number>, text: string): void {
  const lines = text.split('\n').map((l) => ` ${l}`).join('\n');
  const parent = path.length === 1 ? doc.contents : doc.getIn(path.slice(0, -1), true);
  const last = path[path.length - 1];
  if (isSeq(parent) && typeof last === 'number') {
    (parent.items[last] as { commentBefore?: string }).commentBefore = lines;
    return;
  }
  if (isMap(parent)) {
    const pair = pairOf(parent, String(last));
    if (pair) (pair.key as { commentBefore?: string }).commentBefore = lines;
  }
}

/** Write the number lists on one line each ("[0, 2, 4]"), easier to edit. */
function flowLists(doc: Document, paths: Array<Array<string | number>>): void {
  for (const p of paths) {
    const node = doc.getIn(p, true);
    if (isSeq(node) || isMap(node)) (node as YAMLSeq | YAMLMap).flow = true;
  }
}

/**
 * A commented starting sweep spec (YAML) for the question "which smoothing width suits this run?".
 * From a look: its bright first volumes are dropped and its abrupt volume changes censored. The
 * planted size and amplitude are stated defaults to edit (the activation you expect to find); every
 * field is explained in a comment above it. The text parses with `readSweepSpec`.
 * @param look - a look folder's facts (readLookFolder), or null for a spec with no run in mind
 * @returns YAML text starting with {@link STARTER_SPEC_HEADER}
 * @example await writeFileAtomic('spec.yaml', starterSpecYaml(readLookFolder('out/look')))
 */
export function starterSpecYaml(look: LookFolderFacts | null): string {
  const drop = look?.dropInitialVolumes ?? 0;
  const censor = look?.censorVolumes ?? [];
  const spec = defaultSmoothingSpec({ dropInitialVolumes: drop, censorVolumes: censor });
  const doc = new YAML.Document(spec);
  const from = look
    ? `Made by "boldsweep spec" from the look at ${look.runFile ?? 'a run'}${look.runSha256 ? ` (SHA-256 ${look.runSha256.slice(0, 16)}...)` : ''}:\n${look.dims.slice(0, 3).join(' x ')} voxels, ${look.dims[3]} volumes, TR ${look.trSec} s.`
    : 'A starting point with no particular run in mind: "boldsweep spec <look folder>" writes one\nfrom the look at your own run (its bright first volumes dropped, abrupt changes censored).';
  doc.commentBefore = [
    `${STARTER_SPEC_HEADER.slice(2)}: which smoothing width suits this run?`,
    from,
    'Edit the lines marked EDIT, then run:',
    '  boldsweep sweep <run> --spec <this file> --look <look folder> --out <sweep folder>',
    '  boldsweep report <sweep folder>',
    'Every field is explained above it; README.md lists them all.',
  ].join('\n').split('\n').map((l) => ` ${l}`).join('\n');

  note(doc, ['version'], 'Format version of this file; always 1.');
  note(doc, ['recipe'], 'The preprocessing, in order: each step is a registered step name and its fixed parameters.\nA parameter named under "vary" is replaced by each of its values in turn.');
  let i = 0;
  if (drop > 0) {
    const why = look?.why.find((w) => /drop|steady|first/i.test(w));
    note(doc, ['recipe', i], `Drop the first ${drop} volume(s): the look found them brighter than the rest (the signal had not\nyet settled to its steady state). count is in volumes.${why ? `\nThe look: ${why}` : ''}`);
    i++;
  }
  note(doc, ['recipe', i], 'Gaussian spatial smoothing. fwhmMm: kernel width in mm (0 = none; swept below). mode: how the\nimage is extended past its edge (reflect, nearest, mirror, constant, wrap). withinMask: smooth\nonly inside the brain mask.');
  flowLists(doc, [['recipe', i, 'params'], ['recipe', 0, 'params']]);
  note(doc, ['vary'], 'The settings compared: "<step>.<parameter>" (or "model.<option>") and its candidate values.\nThe sweep runs every combination; keep the list short, each value costs a full set of repeats.');
  note(doc, ['vary', 'smooth.fwhmMm'], 'Candidate smoothing widths (FWHM, mm; 0 = none). Widths near the activation size are the ones to\ncover: detection is best when the kernel matches the activation (the matched-filter theorem).');
  flowLists(doc, [['vary', 'smooth.fwhmMm']]);
  note(doc, ['plant'], 'The activations planted into the real run, whose detection scores each setting.');
  note(doc, ['plant', 'shape'], 'Profile of each planted activation: gaussian or sphere.');
  note(doc, ['plant', 'sizesFwhmMm'], 'EDIT: the size of the activation you expect to find, mm (FWHM of a Gaussian; a sphere\'s\ndiameter). Default 8 mm. Several sizes are allowed; the report chooses for one of them.');
  note(doc, ['plant', 'amplitudesPct'], 'EDIT: its peak amplitude in percent signal change. Default 1 % (a 1-2 % BOLD change at 3 T is\ncommon practice, no source). Smaller amplitudes make every setting look worse.');
  note(doc, ['plant', 'count'], 'Activations per planting; 0 plants nothing (a null sweep that counts false alarms only).');
  note(doc, ['plant', 'marginMm'], 'How far (mm) centres stay inside the placement mask\'s edge; null: half the activation size;\n0 for a thin placement mask such as grey matter.');
  note(doc, ['plant', 'separation'], 'Smallest centre-to-centre distance, as a multiple of the activation size.');
  flowLists(doc, [['plant', 'sizesFwhmMm'], ['plant', 'amplitudesPct']]);
  note(doc, ['repeats'], 'Plantings per setting, each at new positions: more repeats, narrower intervals, longer sweep.');
  note(doc, ['threshold'], 'How detections are called: kind is fwe-rft (family-wise error by random-field theory), fdr\n(Benjamini-Hochberg, at q), bonferroni, uncorrected (at alpha per voxel) or cluster (extent, with\nclusterFormingP). alpha: family-wise or voxelwise error rate.');
  note(doc, ['model'], 'The model fitted in every cell.');
  note(doc, ['model', 'ar1'], 'Prewhiten with an AR(1) noise model (true) or ordinary least squares (false).');
  note(doc, ['model', 'ar1SmoothFwhmMm'], 'FWHM (mm) that smooths the AR(1) coefficient map within the brain (Worsley et al. 2002); 0: per voxel.');
  note(doc, ['model', 'highpassCutoffSec'], 'Discrete cosine drift regressors below 1/cutoff Hz, in seconds; null for none.');
  note(doc, ['model', 'trialType'], 'Trial type (events column trial_type) of the tested regressor; null: every event.');
  note(doc, ['model', 'censorVolumes'], censor.length
    ? `Volumes censored (0-based, in the run as opened): the look found abrupt changes there. Each gets\nits own regressor, so it informs neither the effect nor the noise.`
    : 'Volumes to censor (0-based, in the run as opened), e.g. abrupt changes a look found; each gets\nits own regressor, so it informs neither the effect nor the noise.');
  flowLists(doc, [['model', 'censorVolumes'], ['threshold'], ['events']]);
  note(doc, ['events'], 'Task timing: kind run uses the run\'s events file; kind random-blocks (onSec, offMinSec,\noffMaxSec) a new random block design per repeat, for a run without that task (e.g. rest).');
  note(doc, ['acquisition'], 'How planted activations follow the acquisition (a motion table and a field map are given to\nthe sweep command: --motion-table, --field-map).');
  note(doc, ['acquisition', 'sliceTiming'], 'sidecar: each slice follows the task at its own acquisition time (the sidecar\'s SliceTiming);\nnone: every slice at mid-volume.');
  note(doc, ['seed'], 'Seed of every random choice: the same spec and seed give the same scorecard, byte for byte.');
  note(doc, ['workers'], 'Worker threads (the command\'s --workers overrides it).');
  return doc.toString({ lineWidth: 0 });
}
