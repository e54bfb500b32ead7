export default function Home() {
  return (
    <main className="mx-auto max-w-2xl p-10">
      <h1 className="text-4xl">Marginalia</h1>
      <p className="mt-4 text-lg">Renormalization-group derivations, written together and checked step by step.</p>
    </main>
  );
}
