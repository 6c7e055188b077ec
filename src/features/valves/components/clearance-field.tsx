import { TextField } from '../../../components/ui/field';
import { fmtIn, fmtMm, parseClearance, type ClearanceUnit } from '../clearance-format';

interface Props {
  label: string;
  text: string;
  /** The unit the value was typed in. */
  unit: ClearanceUnit;
  /** The card's display unit, which an empty field takes. */
  cardUnit: ClearanceUnit;
  onChange: (text: string, unit: ClearanceUnit) => void;
  error?: string;
  hint?: string;
  disabled?: boolean;
}

/**
 * A clearance typed in mm or inches. A filled field keeps the unit it was typed in when the
 * display unit changes (converting back and forth would drift), and shows the other unit below.
 */
export function ClearanceField({ label, text, unit, cardUnit, onChange, error, hint, disabled }: Props) {
  const shown = text.trim() ? unit : cardUnit;
  const p = parseClearance(text, shown);
  const other = p.mm == null ? null : shown === 'mm' ? `= ${fmtIn(p.mm)} in` : `= ${fmtMm(p.mm)} mm`;
  return (
    <TextField
      label={label}
      inputMode="decimal"
      autoComplete="off"
      value={text}
      suffix={shown}
      disabled={disabled}
      placeholder={shown === 'mm' ? 'e.g. 0.21' : 'e.g. 0.008'}
      onChange={(e) => onChange(e.target.value, text.trim() ? unit : cardUnit)}
      error={error}
      hint={[other, hint].filter(Boolean).join(' · ') || undefined}
      className="num text-reading [&_label]:text-lg"
    />
  );
}
