/** A labelled number input that commits on Enter or blur, shows its unit, and refuses bad text. */
import { useEffect, useId, useState } from 'react';

export interface NumberFieldProps {
  label: string;
  value: number;
  unit?: string;
  step?: number;
  min?: number;
  max?: number;
  digits?: number;
  onCommit: (v: number) => void;
  testId?: string;
}

export function NumberField({ label, value, unit, step, min, max, digits = 2, onCommit, testId }: NumberFieldProps) {
  const id = useId();
  const shown = Number.isFinite(value) ? String(Number(value.toFixed(digits))) : '';
  const [text, setText] = useState(shown);
  const [bad, setBad] = useState(false);
  useEffect(() => {
    setText(shown);
    setBad(false);
  }, [shown]);
  const commit = () => {
    const v = Number(text.trim().replace(',', '.'));
    if (text.trim() === '' || !Number.isFinite(v) || (min !== undefined && v < min) || (max !== undefined && v > max)) {
      setBad(true);
      return;
    }
    setBad(false);
    if (v !== value) onCommit(v);
  };
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <span className="field-input">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          value={text}
          aria-invalid={bad}
          data-testid={testId}
          onChange={(e) => setText(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => {
            if (e.key === 'Enter') commit();
            if (e.key === 'Escape') setText(shown);
          }}
          {...(step !== undefined ? { 'data-step': step } : {})}
        />
        {unit && <span className="unit">{unit}</span>}
      </span>
      {bad && (
        <span className="field-error" role="alert">
          {min !== undefined && max !== undefined ? `a number from ${min} to ${max}` : 'a number'}
        </span>
      )}
    </div>
  );
}
