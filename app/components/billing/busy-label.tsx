import { useNavigation } from "react-router";

/** A submit button's words: `busy` while its own intent is being posted. */
export function BusyLabel({
  intent,
  idle,
  busy,
}: {
  intent: string;
  idle: string;
  busy: string;
}) {
  const navigation = useNavigation();
  const active =
    navigation.state !== "idle" &&
    navigation.formData?.get("intent") === intent;
  return <>{active ? busy : idle}</>;
}
