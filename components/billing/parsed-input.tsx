'use client';
// A text box for a typed amount or rate whose form value is the parsed number (minor units, basis
// points): people type "75.50", the form and the API carry 7550. NaN while the text is not valid.
import { useState, type InputHTMLAttributes } from 'react';
import { Input } from '@/components/ui/field';

type Props = Omit<InputHTMLAttributes<HTMLInputElement>, 'value' | 'onChange' | 'defaultValue'> & {
  value: number | undefined;
  onChange: (value: number) => void;
  parse: (text: string) => number;
  format: (value: number) => string;
};

export function ParsedInput({ value, onChange, parse, format, ...props }: Props) {
  const [text, setText] = useState(() => (value === undefined || Number.isNaN(value) ? '' : format(value)));
  // When the form is reset from outside, show the new value.
  const shown = value !== undefined && !Number.isNaN(value) && parse(text) !== value ? format(value) : text;
  return (
    <Input
      {...props}
      type="text"
      inputMode="decimal"
      autoComplete="off"
      value={shown}
      onChange={(e) => {
        setText(e.target.value);
        onChange(parse(e.target.value));
      }}
    />
  );
}
