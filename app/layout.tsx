import type { Metadata, Viewport } from 'next';
import './globals.css';
import { CautionLine } from './caution-line';

export const metadata: Metadata = { title: 'Plateau', description: 'Procedural sedation record and respiratory-event review' };
export const viewport: Viewport = { width: 'device-width', initialScale: 1, themeColor: '#14171c' };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body>
        <div className="shell">
          {children}
          <CautionLine />
        </div>
      </body>
    </html>
  );
}
