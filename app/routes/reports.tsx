// Placeholder: replaced by the reports page in this change.
export default function Placeholder() {
  return null;
}
