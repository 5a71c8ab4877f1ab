'use client';

import { useRouter } from 'next/navigation';
import { useQuery } from '@tanstack/react-query';
import { useEffect, useState, useTransition } from 'react';
import { analysisFinished, analysisQuery } from '@/components/query/analysisQuery';

type Answer = { analysis?: { id: string; state: string }; error?: { message: string } };
const select = 'rounded-md border border-paper-line bg-paper-raised px-2 py-1.5 text-sm text-ink';

/**
 * Queues a new analysis of this run with other fit settings (POST /api/runs/{id}/analyses), then
 * watches it and refreshes the page when it has finished. Every earlier result is kept.
 */
/** An option whose default follows the trace: on where it has a lamp reference column. */
function ReferenceDefaultSelect({ id, name, label }: { id: string; name: string; label: string }) {
  return (
    <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
      <label htmlFor={id}>{label}</label>
      <select id={id} name={name} className={select} defaultValue="">
        <option value="">With a lamp reference column (default)</option>
        <option value="on">Always</option>
        <option value="off">Never</option>
      </select>
    </div>
  );
}

export function ReanalyseForm({ runId }: { runId: number }) {
  const router = useRouter();
  const [waiting, setWaiting] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  // The status line and the refreshed list of analyses change in one transition, so the line
  // never says "finished" beside a list that still says "waiting".
  const [, startTransition] = useTransition();

  // The queued analysis, asked after until it is done or failed (the upload page's watch does the same).
  const watched = useQuery({ ...analysisQuery(waiting ?? ''), enabled: waiting !== null });
  useEffect(() => {
    const answer = watched.data;
    if (!waiting || !answer || !analysisFinished(answer)) return;
    setWaiting(null);
    startTransition(() => {
      setMessage(`Analysis #${waiting} ${answer.state === 'done' ? 'finished' : 'failed'}.`);
      router.refresh();
    });
  }, [waiting, watched.data, router]);

  async function submit(form: FormData) {
    setMessage(null);
    const settings: Record<string, unknown> = { mode: form.get('mode') };
    for (const key of ['gain', 'heldIndex', 'shutterTimeGrowth', 'shutterTimePopulation', 'overshootPopulation'] as const) if (form.get(key)) settings[key] = form.get(key);
    const thin = String(form.get('thinLayerQwot') ?? '').trim();
    if (thin !== '') settings.thinLayerQwot = Number(thin);
    const drift = form.get('chipDrift');
    if (drift === 'prior') settings.lampDriftFit = true;
    if (drift === 'free') settings.gainDrift = true;
    const lamp = String(form.get('lampStability') ?? '').trim();
    if (lamp !== '') settings.lampStabilityPerHour = Number(lamp) / 100;
    const adoption = String(form.get('offsetAdoption') ?? '').trim();
    if (adoption !== '') settings.offsetAdoptionSigma = Number(adoption);
    const unmeasured = String(form.get('unmeasuredOffset') ?? '').trim();
    if (unmeasured !== '') settings.unmeasuredOffsetSigma = Number(unmeasured) / 100;
    const levelStart = form.get('levelStartTransient');
    if (levelStart === 'on') settings.levelStartTransient = true;
    if (levelStart === 'off') settings.levelStartTransient = false;
    const levelClock = form.get('sequentialLevelClock');
    if (levelClock === 'on') settings.sequentialLevelClock = true;
    if (levelClock === 'off') settings.sequentialLevelClock = false;
    const lowPct = String(form.get('linearityLowPct') ?? '').trim();
    const atReading = String(form.get('linearityAtReading') ?? '').trim();
    if ((lowPct === '') !== (atReading === '')) {
      setMessage('Detector linearity: give both how far low it reads (%) and the reading it was measured at, or neither.');
      return;
    }
    if (lowPct !== '') settings.detectorLinearity = { lowPct: Number(lowPct), atReading: Number(atReading) };
    const overshoot = String(form.get('turningPointOvershoot') ?? '').trim();
    if (overshoot !== '') settings.turningPointOvershootPct = Number(overshoot);
    const cutPast = form.get('cutPastTurningPoint');
    if (cutPast === 'refit') settings.cutPastTurningPoint = 'refit';
    if (cutPast === 'off') settings.cutPastTurningPoint = false;
    const periodic = form.get('periodicDisturbance');
    if (periodic === 'name') settings.rippleDivide = false;
    if (periodic === 'off') settings.runDisturbances = false;
    if (form.get('gainDriftFromChips') !== 'on') settings.gainDriftFromChips = false;
    if (form.get('fitOffset') !== 'on') settings.fitOffset = false;
    if (form.get('offsetAveraging') !== 'on') settings.offsetAveraging = false;
    if (form.get('levelCutGain') !== 'on') settings.levelCutGain = 'free';
    if (form.get('reflectanceChipGain') !== 'on') settings.reflectanceChipGain = false;
    for (const key of ['rateWander', 'indexGradient', 'stackFromLayer'] as const) if (form.get(key) === 'on') settings[key] = true;
    for (const key of ['growthFromNext', 'levelGrowthFromNext', 'startTransient', 'holdUncarriedDrift', 'turningPointExcessMean', 'pooledIndex', 'heldIndexLevelCut', 'fitOnFinalStack', 'fitWithNextLayer', 'lampReference'] as const) if (form.get(key) !== 'on') settings[key] = false;
    const res = await fetch(`/api/runs/${runId}/analyses`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(settings) });
    const body = (await res.json().catch(() => ({}))) as Answer;
    if (res.status === 201 && body.analysis) {
      setWaiting(body.analysis.id);
      router.refresh();
    } else setMessage(body.error?.message ?? `The server answered ${res.status}.`);
  }

  return (
    // Submitted by hand, not as a form action: an action resets every field once it returns, so a
    // refused request (half a linearity, a server's answer) would have cleared what was entered.
    <form
      onSubmit={(e) => {
        e.preventDefault();
        void submit(new FormData(e.currentTarget));
      }}
      className="flex flex-col gap-3"
      data-testid="reanalyse-form"
    >
      <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-mode">Mode</label>
          <select id="re-mode" name="mode" className={select} defaultValue="refit">
            <option value="refit">Joint re-fit</option>
            <option value="sequential">Layer by layer</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-gain">Detector gain</label>
          <select id="re-gain" name="gain" className={select} defaultValue="">
            <option value="">Mode default</option>
            <option value="chip">One per chip (from its bare-chip stretch)</option>
            <option value="per-layer">Fitted per layer</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-held">Index of thin layers</label>
          <select id="re-held" name="heldIndex" className={select} defaultValue="">
            <option value="">Default (this run&apos;s drift estimate)</option>
            <option value="run-drift">Held at this run&apos;s drift estimate</option>
            <option value="nominal">Held at the nominal index</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-thin">Below this many QWOT a trial fit decides whether to hold the index (0: every index free)</label>
          <input id="re-thin" name="thinLayerQwot" type="number" min="0" max="4" step="0.05" placeholder="0.9 (default)" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-drift">Gain drift within a chip (lamp, detector)</label>
          <select id="re-drift" name="chipDrift" className={select} defaultValue="">
            <option value="">Held; lamp stability in every σ</option>
            <option value="prior">Fitted under the lamp&apos;s stability (joint re-fit)</option>
            <option value="free">Fitted freely (joint re-fit, one gain per chip)</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-shutter">Growth after the cut of a chip&apos;s last layer (nothing above it tells)</label>
          <select id="re-shutter" name="shutterTimeGrowth" className={select} defaultValue="">
            <option value="">Mode default</option>
            <option value="run-mean">The run&apos;s shutter time as read (joint re-fit&apos;s default)</option>
            <option value="bounded">That time kept within 0–2 s (layer by layer&apos;s default)</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-shutter-pop">Shutter times across the run, as a population (each cut&apos;s growth prior)</label>
          <select id="re-shutter-pop" name="shutterTimePopulation" className={select} defaultValue="">
            <option value="">Normal spread (default)</option>
            <option value="mixture">Cut at 0, with their uncertainty</option>
            <option value="truncated">Cut at 0, at their best fit</option>
          </select>
        </div>
        <ReferenceDefaultSelect id="re-level-start" name="levelStartTransient" label="On a run cut only on level: the rate's start-up as the shutter opens, found with the lamp drift in each chip's joint fit" />
        <ReferenceDefaultSelect id="re-level-clock" name="sequentialLevelClock" label="Layer by layer, where that start-up is found: each level cut fitted on its clock (else on real time, the chip's lamp drift held as found with it)" />
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-cut-past">A chip&apos;s last turning-point cut held at or past its fitted turning point, by up to the overshoot below, where the reading is sharp enough to show a later cut (a controller that cuts once it sees the turning point; a hand cut well past it stands)</label>
          <select id="re-cut-past" name="cutPastTurningPoint" className={select} defaultValue="both">
            <option value="both">In both modes (default)</option>
            <option value="refit">In the joint re-fit only</option>
            <option value="off">Not held (the fit&apos;s own reading)</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-overshoot-pop">That last cut&apos;s overshoot, as the run&apos;s other turning-point cuts show it</label>
          <select id="re-overshoot-pop" name="overshootPopulation" className={select} defaultValue="">
            <option value="">From the run (default)</option>
            <option value="truncated">From the run, at its best fit only</option>
            <option value="uniform">Not from the run: uniform up to the overshoot</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-periodic">A periodic disturbance through the run (a lamp&apos;s ripple the sampling turns into a slow beat, the holder&apos;s rotation), sought in all the layers&apos; residuals together; without a reference column, divided out as the lamp&apos;s and the run analysed again</label>
          <select id="re-periodic" name="periodicDisturbance" className={select} defaultValue="divide">
            <option value="divide">Named and divided out (default)</option>
            <option value="name">Named only (not the lamp&apos;s)</option>
            <option value="off">Not sought</option>
          </select>
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-lamp">Lamp stability, %/h (0: none assumed)</label>
          <input id="re-lamp" name="lampStability" type="number" min="0" max="20" step="0.1" placeholder="1 (default)" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-adoption">Without averaging: a fitted offset replaces the assumed one beyond this many σ from it</label>
          <input id="re-adoption" name="offsetAdoption" type="number" min="0" max="10" step="0.5" placeholder="3 (default)" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-unmeasured">Where a chip&apos;s offset is neither read dark nor told by its layers: its σ in every layer, % of full scale (0: taken as exact)</label>
          <input id="re-unmeasured" name="unmeasuredOffset" type="number" min="0" max="5" step="0.05" placeholder="0.3 (default)" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-linearity-low">Detector linearity, from the shop&apos;s own check (e.g. calibrated neutral-density filters): it reads this many % low… (empty: linear)</label>
          <input id="re-linearity-low" name="linearityLowPct" type="number" min="0" max="20" step="0.01" placeholder="0 (linear)" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft">
          <label htmlFor="re-linearity-at">…at this reading, in the trace&apos;s signal units (the readings are linearised before the fit)</label>
          <input id="re-linearity-at" name="linearityAtReading" type="number" min="0" step="any" placeholder="e.g. the bare chip's reading" className={select} />
        </div>
        <div className="flex flex-col gap-1 text-xs text-ink-soft sm:col-span-2">
          <label htmlFor="re-overshoot">The controller&apos;s overshoot: how far past a turning point the controller may cut, % of the layer (without a layer column its mean goes into the thickness, its spread into σ; it also bounds the held last cut above)</label>
          <input id="re-overshoot" name="turningPointOvershoot" type="number" min="0" max="10" step="0.1" placeholder="1 (default)" className={select} />
        </div>
        <div className="flex flex-col justify-end gap-1 text-sm sm:col-span-2 lg:col-span-4">
          <label className="flex items-center gap-2">
            <input type="checkbox" name="gainDriftFromChips" defaultChecked /> Gain drift from chip to chip
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="fitOffset" defaultChecked /> Fit the detector offset (stray light) where a chip has no dark reading
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="offsetAveraging" defaultChecked /> Average that fitted offset with the one assumed by the evidence for it, both in σ (unchecked: taken only past the σ set above)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="levelCutGain" defaultChecked /> Layer by layer, a layer cut on level keeps its chip&apos;s calibrated gain where the bare chip read it well (unchecked: a gain of its own)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="reflectanceChipGain" defaultChecked /> In reflectance, every layer keeps the chip&apos;s gain where its first layers pinned it better than a layer&apos;s own gain would be
          </label>
        </div>
        <fieldset className="flex flex-col gap-1 text-sm sm:col-span-2 lg:col-span-4" data-testid="reanalyse-effects">
          <legend className="mb-1 text-xs text-ink-soft">
            More of the chamber in the model (checked: the defaults; each option helps some runs and costs others; the run page&apos;s warnings say what was found)
          </legend>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="growthFromNext" defaultChecked /> Read the growth after a turning-point cut from the next layer&apos;s start
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="turningPointExcessMean" defaultChecked /> Without a layer column: a turning-point cut&apos;s thickness at the mean overshoot past its turning point (unchecked: on the turning point)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="pooledIndex" defaultChecked /> Read each material&apos;s indices together (a layer&apos;s index from its material&apos;s trend across the run and its own reading; n·d kept)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="heldIndexLevelCut" defaultChecked /> Judge every level-cut layer&apos;s index as a thin layer&apos;s: held at its material&apos;s reading from the run where the layer&apos;s own data tell it less well
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="levelGrowthFromNext" defaultChecked /> Joint re-fit: read a level cut&apos;s growth after the cut again from the next layer&apos;s start where that layer is a turning-point cut (as after a turning-point cut)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="fitOnFinalStack" defaultChecked /> Layer by layer: fit a layer again where the stack below it changed after its fit (the growths after the cuts read again once the run&apos;s shutter time is known)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="fitWithNextLayer" defaultChecked /> Layer by layer: fit each level-cut layer again with the next two on its chip (they grow on the stack it left; a thin layer&apos;s held index from the whole run; not on a chip whose next layers show the rate starting up as the shutter opens)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="lampReference" defaultChecked /> Where the trace has a reference column (the lamp read directly), divide the signal by it
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="rateWander" /> The rate may wander within a layer (kept only where the data asks for it)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="startTransient" defaultChecked /> The rate starts up as the shutter opens (one start delay for the run, on layers cut at a turning point)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="holdUncarriedDrift" defaultChecked /> In the joint re-fit, hold a layer&apos;s rate drift at zero where its data do not carry it (white residuals only)
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="indexGradient" /> The index may change through layers of 1.5 QWOT or more
          </label>
          <label className="flex items-center gap-2">
            <input type="checkbox" name="stackFromLayer" /> Layer by layer: read the stack below again with each level cut&apos;s own data in reflectance (thin layers under a cut near its extremum)
          </label>
        </fieldset>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" disabled={waiting !== null} className="rounded-md bg-fringe px-4 py-1.5 text-sm font-medium text-paper-raised hover:bg-fringe-dark disabled:opacity-50">
          {waiting ? `Analysis #${waiting} in the queue…` : 'Queue the analysis'}
        </button>
        {message ? <span className="text-sm text-ink-soft" role="status">{message}</span> : null}
        {waiting && watched.error ? (
          <span className="text-sm text-alarm" role="status">
            Could not read analysis #{waiting}&apos;s state ({watched.error.message}); still asking every few seconds.
          </span>
        ) : null}
      </div>
    </form>
  );
}
