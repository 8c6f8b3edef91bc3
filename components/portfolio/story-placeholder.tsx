/** "Kestrel Ridge Motor Works" → "KR"; the first letters of the first two words. */
export function shopInitials(name: string): string {
  const words = name.replace(/[^\p{L}\p{N}\s]/gu, " ").split(/\s+/).filter(Boolean);
  return (words.slice(0, 2).map((w) => [...w][0]!.toUpperCase()).join("") || "·").slice(0, 3);
}

/**
 * The cover of a story without a photo: a field of bolt heads (hexagons) in the shop's brass,
 * with the shop's initials on a washer in the middle. Decorative (the card's title says what it
 * is), so hidden from assistive technology. `id` keeps each card's pattern its own.
 */
export function StoryPlaceholder({ id, shopName }: { id: string; shopName: string }) {
  const pattern = `bolts-${id.replace(/[^A-Za-z0-9_-]/g, "")}`;
  return (
    <svg aria-hidden viewBox="0 0 400 300" preserveAspectRatio="xMidYMid slice" className="aspect-[4/3] w-full bg-sunken" data-testid="story-placeholder">
      <defs>
        <pattern id={pattern} width="36" height="31.18" patternUnits="userSpaceOnUse" patternTransform="rotate(8)">
          {/* Two rows of hexagons, offset half a width, read as a tray of bolt heads. */}
          <path d="M9 0h18l9 15.59-9 15.59H9L0 15.59z" fill="none" stroke="currentColor" strokeWidth="1.5" className="text-brass" opacity="0.45" />
          <circle cx="18" cy="15.59" r="4" fill="currentColor" className="text-brass" opacity="0.25" />
        </pattern>
      </defs>
      <rect width="400" height="300" fill={`url(#${pattern})`} />
      <circle cx="200" cy="150" r="62" fill="currentColor" className="text-surface" />
      <circle cx="200" cy="150" r="62" fill="none" stroke="currentColor" strokeWidth="6" className="text-oil" />
      <circle cx="200" cy="150" r="46" fill="none" stroke="currentColor" strokeWidth="1.5" className="text-oil" opacity="0.5" />
      <text x="200" y="152" textAnchor="middle" dominantBaseline="central" fontSize="44" fontWeight="800" fill="currentColor" className="text-ink">
        {shopInitials(shopName)}
      </text>
    </svg>
  );
}
