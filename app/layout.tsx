import type { Metadata } from 'next';
import type { ReactNode } from 'react';
import '@fontsource/eb-garamond/400.css';
import '@fontsource/eb-garamond/400-italic.css';
import '@fontsource/eb-garamond/600.css';
import '@fontsource/jetbrains-mono/400.css';
import 'katex/dist/katex.min.css';
import './globals.css';

export const metadata: Metadata = {
  title: 'Marginalia',
  description: 'Renormalization-group derivations, written together and checked step by step.',
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <body className="min-h-screen bg-paper font-serif text-ink antialiased">{children}</body>
    </html>
  );
}
