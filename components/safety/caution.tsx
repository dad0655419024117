// The safety wording every screen and document that shows a verdict carries (see DESIGN.md).
// The same sentences are exported as text for PDFs and e-mails.
export const CAUTION_LINES = [
  'These figures support, and do not replace, the engineer’s judgement, the manufacturer’s instructions and the codes in force locally.',
  'Shipped limit presets are reference values: check them against the edition your jurisdiction has adopted.',
] as const;

export const HIGH_ROOM_CO_ADVICE = [
  'Open doors and windows.',
  'Get everyone out of the property, and keep them out.',
  'Turn the appliance off, and the supply at the meter if it is safe to do so.',
  'Anyone with headache, dizziness, nausea or confusion should get medical help now; call the emergency services if someone is drowsy or unconscious.',
] as const;

export function SafetyCaution({ showRoomCoAdvice = false, compact = false }: { showRoomCoAdvice?: boolean; compact?: boolean }) {
  return (
    <aside aria-label="Safety caution" className={`rounded-lg border border-line bg-white ${compact ? 'p-2 text-xs' : 'p-3 text-sm'} text-ink-soft`}>
      {CAUTION_LINES.map((line) => (
        <p key={line}>{line}</p>
      ))}
      {showRoomCoAdvice ? (
        <div className="mt-2 text-ink">
          <p className="font-bold">If room CO is high:</p>
          <ul className="ml-4 list-disc">
            {HIGH_ROOM_CO_ADVICE.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </div>
      ) : null}
    </aside>
  );
}
