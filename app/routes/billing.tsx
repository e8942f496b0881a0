// Placeholder: replaced by the billing page in this change.
export default function Placeholder() {
  return null;
}
