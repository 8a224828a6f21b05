/**
 * The Halfmark wordmark: a diamond split down its middle, one half solid and one half outlined
 * (a specimen and its two halves), followed by the name.
 */
export function Wordmark({ className = '', tone = 'light' }: { className?: string; tone?: 'light' | 'dark' }) {
  const text = tone === 'light' ? '#f4f6f8' : '#161e29';
  return (
    <svg className={className} viewBox="0 0 168 32" role="img" aria-label="Halfmark" xmlns="http://www.w3.org/2000/svg">
      <path d="M17 3 30 16 17 29Z" fill="#df8a43" />
      <path d="M14 3 1 16 14 29Z" fill="none" stroke={text} strokeWidth="2.2" strokeLinejoin="round" />
      <text x="38" y="23" fill={text} fontFamily="Inter, system-ui, sans-serif" fontSize="21" fontWeight="700" letterSpacing="-0.4">
        half<tspan fill="#df8a43">mark</tspan>
      </text>
    </svg>
  );
}
