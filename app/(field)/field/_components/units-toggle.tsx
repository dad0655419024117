'use client';
// °C or °F for temperatures, kW or Btu/h for heat input: the engineer's choice, kept on the phone.
import { useField } from './use-field';

function Segmented<T extends string>({ label, value, options, onChange }: { label: string; value: T; options: ReadonlyArray<{ value: T; text: string }>; onChange: (v: T) => void }) {
  return (
    <div role="group" aria-label={label} className="inline-flex overflow-hidden rounded-lg border border-line bg-white">
      {options.map((o) => (
        <button key={o.value} type="button" aria-pressed={value === o.value} onClick={() => onChange(o.value)} className={`min-h-11 min-w-14 px-3 text-sm font-semibold ${value === o.value ? 'bg-ink text-paper' : 'text-ink'}`}>
          {o.text}
        </button>
      ))}
    </div>
  );
}

export function UnitsToggle() {
  const { prefs, setPreference } = useField();
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      <span className="font-semibold">Units</span>
      <Segmented label="Temperature unit" value={prefs.tempUnit} options={[{ value: 'C', text: '°C' }, { value: 'F', text: '°F' }]} onChange={(v) => void setPreference('tempUnit', v)} />
      <Segmented label="Heat input unit" value={prefs.powerUnit} options={[{ value: 'kW', text: 'kW' }, { value: 'Btu/h', text: 'Btu/h' }]} onChange={(v) => void setPreference('powerUnit', v)} />
    </div>
  );
}

export { Segmented };
