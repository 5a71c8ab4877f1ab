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
 * A coating in cross-section: the layers of a stack as strata of two tints (thicknesses from a
 * quarter-wave mirror with a spacer), and a ray of light falling on it, part of it sent back at
 * every interface. What Fringelog measures is the sum of those partial reflections.
 */
function FringeBackdrop() {
  const thicknesses = [9, 15, 9, 15, 9, 15, 30, 15, 9, 15, 9, 15, 9];
  const surface = 120;
  let y = surface;
  const strata = thicknesses.map((h, i) => {
    const band = { y, h, high: i % 2 === 0 };
    y += h;
    return band;
  });
  const entry = 130;
  // Inside the stack the ray runs steeper (refraction); each interface sends part of it back up.
  const rays = strata.slice(0, 8).map((s, i) => ({ x: entry + (s.y - surface) * 0.35, y: s.y, opacity: 0.55 - i * 0.05 }));
  const last = rays[rays.length - 1];
  return (
    <svg className="absolute inset-x-0 bottom-0 h-[36%] w-full" viewBox="0 0 400 300" preserveAspectRatio="none" aria-hidden="true">
      {strata.map((s) => (
        <rect key={s.y} x="0" y={s.y} width="400" height={s.h} fill={s.high ? '#5fb3b3' : '#f6f4ee'} fillOpacity={s.high ? 0.16 : 0.05} />
      ))}
      <rect x="0" y={y} width="400" height={300 - y} fill="#f6f4ee" fillOpacity="0.1" />
      <line x1={entry - 110} y1="0" x2={entry} y2={surface} stroke="#f6ead2" strokeOpacity="0.7" strokeWidth="2" vectorEffect="non-scaling-stroke" />
      <line x1={entry} y1={surface} x2={last.x} y2={last.y} stroke="#f6ead2" strokeOpacity="0.45" strokeWidth="1.5" vectorEffect="non-scaling-stroke" />
      {rays.map((r) => (
        <line key={r.y} x1={r.x} y1={r.y} x2={r.x + 110 + (r.y - surface) * 0.9} y2="0" stroke="#c77aa6" strokeOpacity={r.opacity} strokeWidth="1.5" vectorEffect="non-scaling-stroke" />
      ))}
    </svg>
  );
}
