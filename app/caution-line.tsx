import { CAUTION_TEXT } from '@/lib/domain/caution';

/** The caution every screen carries. */
export function CautionLine() {
  return (
    <div className="caution" role="note" data-testid="caution">
      {CAUTION_TEXT}
    </div>
  );
}
