import { useNavigation } from "react-router";

/** A thin bar at the top while a route's loaders run, so slow pages do not feel stuck. */
export function NavigationProgress() {
  const navigation = useNavigation();
  if (navigation.state === "idle") return null;
  return (
    <div className="pointer-events-none fixed inset-x-0 top-0 z-[60] h-0.5 overflow-hidden" role="progressbar" aria-label="Loading page">
      <div className="h-full w-1/3 animate-[orthostack-progress_1.1s_ease-in-out_infinite] bg-gyro" />
    </div>
  );
}
