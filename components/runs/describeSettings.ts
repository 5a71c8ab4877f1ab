/** Words for a settings object, for lists ("refit · gain per chip · thin layers held at nominal"). */
export function describeSettings(s: Record<string, unknown>): string {
  const parts = [String(s.mode ?? '')];
  if (s.gain === 'chip') parts.push('one gain per chip');
  if (s.gain === 'per-layer') parts.push('gain per layer');
  if (s.levelCutGain === 'free') parts.push('own gain on level-cut layers');
  if (s.gainDrift === true) parts.push('gain drift fitted');
  if (s.lampDriftFit === true) parts.push("gain drift fitted under the lamp's stability");
  if (typeof s.lampStabilityPerHour === 'number') parts.push(`lamp stability ${+(s.lampStabilityPerHour * 100).toFixed(3)} %/h`);
  if (s.lampReference === false) parts.push('lamp reference column not used');
  if (s.reflectanceChipGain === false) parts.push('own gain per layer in reflectance');
  if (s.offsetAveraging === false) parts.push('fitted offset taken or left by a threshold');
  if (typeof s.offsetAdoptionSigma === 'number') parts.push(`fitted offset taken beyond ${+s.offsetAdoptionSigma.toFixed(2)} σ`);
  if (typeof s.unmeasuredOffsetSigma === 'number') parts.push(`unmeasured offset σ ${+(s.unmeasuredOffsetSigma * 100).toFixed(3)} % of full scale`);
  if (s.gainDriftFromChips === false) parts.push('no chip-to-chip gain drift');
  if (s.heldIndex === 'nominal') parts.push('thin layers held at the nominal index');
  if (s.heldIndex === 'run-drift') parts.push("thin layers held at the run's drift index");
  if (typeof s.thinLayerQwot === 'number') parts.push(`held below ${s.thinLayerQwot} QWOT`);
  if (s.rateWander === true) parts.push('rate wander within layers');
  if (s.startTransient === true) parts.push("rate's start-up at the shutter");
  if (s.startTransient === false) parts.push('no start-up at the shutter');
  if (s.levelStartTransient === true) parts.push('start-up on level cuts');
  if (s.levelStartTransient === false) parts.push('no start-up on level cuts');
  if (s.sequentialLevelClock === true) parts.push("level cuts on the start-up's clock layer by layer");
  if (s.sequentialLevelClock === false) parts.push('level cuts on real time layer by layer');
  if (s.holdUncarriedDrift === false) parts.push('every rate drift free');
  if (s.indexGradient === true) parts.push('index gradient in thick layers');
  if (s.shutterTimeGrowth === 'bounded') parts.push("last layers' growth within 0–2 s of shutter time");
  if (s.shutterTimeGrowth === 'run-mean') parts.push("last layers' growth at the run's shutter time");
  if (s.shutterTimePopulation === 'mixture') parts.push('shutter times cut at 0, with their uncertainty');
  if (s.shutterTimePopulation === 'truncated') parts.push('shutter times cut at 0');
  if (s.overshootPopulation === 'uniform') parts.push("last cuts' overshoot uniform, not from the run");
  if (s.overshootPopulation === 'truncated') parts.push("last cuts' overshoot from the run at its best fit");
  if (s.growthFromNext === false) parts.push('growth after turning-point cuts in σ only');
  if (s.levelGrowthFromNext === false) parts.push('growth after level cuts from the idle level only');
  if (s.turningPointExcessMean === false) parts.push('turning-point cuts placed on the turning point');
  if (s.pooledIndex === false) parts.push('each index read alone');
  if (s.heldIndexLevelCut === false) parts.push('thick level-cut layers\' indices always free');
  if (s.fitOnFinalStack === false) parts.push('each layer fitted once');
  if (s.fitWithNextLayer === false) parts.push('each level cut fitted alone');
  if (s.stackFromLayer === true) parts.push('stack below read again with each layer');
  if (s.cutPastTurningPoint === false) parts.push("chips' last turning-point cuts not held past the turning point");
  if (s.cutPastTurningPoint === 'refit') parts.push("chips' last turning-point cuts held past the turning point in the joint re-fit only");
  if (typeof s.turningPointOvershootPct === 'number') parts.push(`turning-point overshoot up to ${+s.turningPointOvershootPct.toFixed(3)} %`);
  if (s.runDisturbances === false) parts.push('no search for a periodic disturbance through the run');
  else if (s.rippleDivide === false) parts.push('a lamp ripple found through the run named, not divided out');
  const linearity = s.detectorLinearity as { lowPct?: unknown; atReading?: unknown } | undefined;
  if (linearity && typeof linearity.lowPct === 'number' && typeof linearity.atReading === 'number' && linearity.lowPct > 0) {
    parts.push(`detector linearised: ${+linearity.lowPct.toFixed(4)} % low at a reading of ${+linearity.atReading.toPrecision(4)}`);
  }
  return parts.join(' · ');
}
