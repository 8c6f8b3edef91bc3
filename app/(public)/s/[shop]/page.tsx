import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import clsx from "clsx";
import { Wrench } from "lucide-react";
import { OpeningHours } from "@/components/portfolio/opening-hours";
import { ShopContactList } from "@/components/portfolio/shop-contact";
import { StoryPlaceholder } from "@/components/portfolio/story-placeholder";
import { EmptyState } from "@/components/ui";
import { MACHINE_KIND_LABEL, type MachineKind } from "@/lib/machine";
import { type PublicStoryCard, storyPath } from "@/lib/portfolio";
import { publicFaceFor } from "@/lib/server/booking";
import { getPublicShopPage, parseKind } from "@/lib/server/portfolio-public";
import { BookingForm } from "./_components/booking-form";

// The shop's public page: who they are, where (as they choose to say it), how to reach them, and
// their finished-job stories, filterable by kind of machine. Rendered per request from a couple of
// indexed queries, so a story taken down is gone from the grid at once.

type Props = { params: Promise<{ shop: string }>; searchParams: Promise<{ kind?: string | string[] }> };

const load = cache((slug: string, kind: MachineKind | null) => getPublicShopPage(slug, kind));

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { shop: slug } = await params;
  const page = await load(slug, null);
  if (!page) return { title: "Not found", robots: { index: false } };
  const description = (page.shop.about ?? `Finished jobs from ${page.shop.name}: photos, clips and notes from the bench.`).slice(0, 200);
  return {
    title: { absolute: `${page.shop.name} · finished jobs` },
    description,
    alternates: { canonical: `/s/${page.shop.slug}` },
    openGraph: { type: "website", title: page.shop.name, description, url: `/s/${page.shop.slug}`, siteName: "Benchside" },
    twitter: { card: "summary_large_image", title: page.shop.name, description },
  };
}

export default async function ShopPortfolioPage({ params, searchParams }: Props) {
  const { shop: slug } = await params;
  const kind = parseKind((await searchParams).kind);
  const [page, face] = await Promise.all([load(slug, kind), publicFaceFor(slug)]);
  if (!page || !face) notFound();
  const { shop } = page;
  return (
    <main id="main" tabIndex={-1} className="mx-auto max-w-5xl space-y-8 px-4 py-8">
      <header className="flex flex-col gap-4 sm:flex-row sm:items-start">
        {shop.logoUrl ? (
          // eslint-disable-next-line @next/next/no-img-element -- served by our own logo route
          <img src={shop.logoUrl} alt={`${shop.name} logo`} width={96} height={96} className="size-24 shrink-0 rounded-xl border border-line bg-surface object-contain" />
        ) : null}
        <div className="min-w-0 space-y-3">
          <h1 className="text-3xl font-extrabold leading-tight text-ink sm:text-4xl">{shop.name}</h1>
          {shop.about ? <p className="max-w-prose whitespace-pre-line text-lg text-ink">{shop.about}</p> : null}
          {shop.takesIn ? (
            <div className="max-w-prose">
              <h2 className="text-sm font-semibold uppercase tracking-wide text-oil">What we take in</h2>
              <p className="whitespace-pre-line text-ink">{shop.takesIn}</p>
            </div>
          ) : null}
          <ShopContactList shop={shop} label="How to find and reach the shop" />
        </div>
      </header>

      <div className="grid gap-8 md:grid-cols-[auto_1fr]">
        <OpeningHours hours={face.openingHours} timezone={face.timezone} />
        <section aria-labelledby="booking-heading" className="relative max-w-2xl space-y-3">
          <h2 id="booking-heading" className="text-xl font-bold text-ink">
            Ask for a booking
          </h2>
          <p className="text-ink-muted">Tell the shop about your machine; they answer by e-mail or phone.</p>
          <BookingForm shop={shop.slug} ticket={face.ticket} />
        </section>
      </div>

      <section aria-labelledby="stories-heading" className="space-y-4">
        <h2 id="stories-heading" className="text-2xl font-bold text-ink">
          Finished jobs
        </h2>
        {page.kinds.length > 1 ? <KindFilter slug={shop.slug} kinds={page.kinds} current={kind} /> : null}
        {page.stories.length ? (
          <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {page.stories.map((s) => (
              <li key={s.slug}>
                <StoryCard shop={shop.slug} shopName={shop.name} story={s} />
              </li>
            ))}
          </ul>
        ) : (
          <EmptyState
            icon={Wrench}
            title={kind ? `No ${MACHINE_KIND_LABEL[kind].toLowerCase()} stories yet` : "No finished jobs to show yet"}
            description={kind ? <Link href={`/s/${shop.slug}`} className="font-semibold text-oil underline">Show every kind of machine</Link> : "Stories appear here once an owner agrees to share how their job went."}
          />
        )}
      </section>
    </main>
  );
}

function KindFilter({ slug, kinds, current }: { slug: string; kinds: MachineKind[]; current: MachineKind | null }) {
  const options: { href: string; label: string; on: boolean }[] = [
    { href: `/s/${slug}`, label: "All machines", on: current == null },
    ...kinds.map((k) => ({ href: `/s/${slug}?kind=${k}`, label: MACHINE_KIND_LABEL[k], on: current === k })),
  ];
  return (
    <nav aria-label="Filter by kind of machine">
      <ul className="flex flex-wrap gap-2">
        {options.map((o) => (
          <li key={o.href}>
            <Link
              href={o.href}
              aria-current={o.on ? "page" : undefined}
              className={clsx("inline-flex min-h-tap items-center rounded-full border px-4 font-semibold", o.on ? "border-oil bg-oil text-oil-on" : "border-line-strong bg-surface text-ink hover:bg-sunken")}
            >
              {o.label}
            </Link>
          </li>
        ))}
      </ul>
    </nav>
  );
}

function StoryCard({ shop, shopName, story }: { shop: string; shopName: string; story: PublicStoryCard }) {
  return (
    <article className="flex h-full flex-col overflow-hidden rounded-xl border border-line bg-surface shadow-sm">
      {story.cover ? (
        // eslint-disable-next-line @next/next/no-img-element -- served by the story's own photo route
        <img src={story.cover.thumbUrl} alt="" width={story.cover.width} height={story.cover.height} loading="lazy" className="aspect-[4/3] w-full bg-sunken object-cover" />
      ) : (
        <StoryPlaceholder id={story.slug} shopName={shopName} />
      )}
      <div className="flex flex-1 flex-col gap-2 p-4">
        <p className="text-sm font-semibold uppercase tracking-wide text-oil">{story.machine.kindLabel}</p>
        <h3 className="text-lg font-bold leading-snug text-ink">
          <Link href={storyPath(shop, story.slug)} className="underline-offset-2 hover:underline focus-visible:underline">
            {story.title}
          </Link>
        </h3>
        <p className="text-ink-muted">{story.machine.label}</p>
        {story.excerpt ? <p className="text-ink">{story.excerpt}</p> : null}
      </div>
    </article>
  );
}
