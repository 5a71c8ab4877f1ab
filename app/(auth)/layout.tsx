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

/** A two-beam interference pattern, cos² of a slowly chirped phase, drawn as bands. */
function FringeBackdrop() {
  const bands = Array.from({ length: 26 }, (_, i) => i);
  return (
    <svg className="absolute inset-0 h-full w-full opacity-25" viewBox="0 0 400 600" preserveAspectRatio="none" aria-hidden="true">
      {bands.map((i) => {
        const y = 600 * Math.sqrt(i / 26);
        return <rect key={i} x="0" y={y} width="400" height={Math.max(2, 9 - i * 0.25)} fill={i % 2 ? '#c77aa6' : '#5fb3b3'} />;
      })}
    </svg>
  );
}
