// Placeholder: replaced by the reports-verify page in this change.
export default function Placeholder() {
  return null;
}
