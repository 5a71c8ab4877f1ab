import { LogoMark } from '@/components/brand/LogoMark';

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="grid min-h-screen md:grid-cols-[minmax(0,5fr)_minmax(0,4fr)]">
      <aside className="relative hidden overflow-hidden bg-ink text-paper md:flex md:flex-col md:justify-between md:p-12">
        <FringeBackdrop />
        <div className="relative flex items-center gap-3">
          <LogoMark size={40} />
          <span className="text-2xl font-semibold tracking-tight">Fringelog</span>
        </div>
        <div className="relative max-w-md">
          <p className="text-3xl font-semibold leading-tight">Every layer, read back from the monitor trace.</p>
          <p className="mt-4 text-paper-sunk/80">
            Fit each layer of a run against its design: thickness, index, rate and cut error, per chamber and per shift.
          </p>
        </div>
        <p className="relative font-mono text-xs text-paper-sunk/60">Larkspur Optical Works · demo installation</p>
      </aside>
      <main className="flex items-center justify-center p-6">
        <div className="w-full max-w-sm">
          <div className="mb-8 flex items-center gap-2 md:hidden">
            <LogoMark size={32} />
            <span className="text-xl font-semibold">Fringelog</span>
          </div>
          {children}
        </div>
      </main>
    </div>
  );
}

/**
 * A sketch of what Fringelog reads: the transmittance of a witness chip while a quarter-wave
 * stack grows. Each layer runs from one turning point to the next; the minima deepen as the
 * stack's reflectance builds up.
 */
function FringeBackdrop() {
  const extremes = [0.92, 0.78, 0.91, 0.6, 0.9, 0.44, 0.89, 0.31, 0.88, 0.22, 0.87];
  const layerWidth = 400 / (extremes.length - 1);
  const y = (t: number) => 560 - t * 240;
  const layers = extremes.slice(1).map((end, i) => {
    const start = extremes[i];
    const points: string[] = [];
    for (let k = 0; k <= 24; k++) {
      const f = k / 24;
      const value = start + ((end - start) * (1 - Math.cos(Math.PI * f))) / 2;
      points.push(`${(i + f) * layerWidth},${y(value).toFixed(1)}`);
    }
    return { x: i * layerWidth, d: `M${points.join(' L')}` };
  });
  return (
    <svg className="absolute inset-x-0 bottom-0 h-[70%] w-full" viewBox="0 0 400 600" preserveAspectRatio="none" aria-hidden="true">
      {layers.map((l, i) => (
        <g key={l.x}>
          <line x1={l.x} x2={l.x} y1="300" y2="580" stroke="#f6f4ee" strokeOpacity="0.08" strokeDasharray="2 4" />
          <path d={l.d} fill="none" stroke={i % 2 ? '#c77aa6' : '#5fb3b3'} strokeWidth="2.2" strokeOpacity="0.55" vectorEffect="non-scaling-stroke" />
        </g>
      ))}
    </svg>
  );
}
