// Placeholder: replaced by the sign-up page in this change.
export default function Placeholder() {
  return null;
}
