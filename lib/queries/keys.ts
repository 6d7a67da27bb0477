// Query keys in one place: mutations invalidate by prefix.
export const queryKeys = {
  workshop: { all: ["workshop"] as const, settings: () => ["workshop", "settings"] as const },
};
