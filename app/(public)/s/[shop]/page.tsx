import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { Wrench } from "lucide-react";
import { PhotoImg } from "@/components/journal/photo-img";
import { OpeningHours } from "@/components/portfolio/opening-hours";
import { ShopContactList } from "@/components/portfolio/shop-contact";
import { StoryPlaceholder } from "@/components/portfolio/story-placeholder";
import { EmptyState } from "@/components/ui";
import { MACHINE_KIND_LABEL } from "@/lib/machine";
import { type PublicStoryCard, storyPath } from "@/lib/portfolio";
import { loadPublicShopPage } from "@/lib/server/portfolio-cache";
import { BookingForm } from "./_components/booking-form";
import { StoryGrid } from "./_components/story-grid";

// The shop's public page: who they are, where (as they choose to say it), how to reach them, and
// their finished-job stories, filterable by kind of machine. Static: rendered on the first visit,
// then served from the cache until a change drops the shop's public pages
// (lib/server/portfolio-cache.ts), so a story taken down is gone from the grid at once. Nothing
// here reads the request: the kind filter runs in the browser (StoryGrid) and the booking form
// fetches its own fresh ticket.

type Props = { params: Promise<{ shop: string }> };

// ISR for every shop, none at build time (no database there): [] with dynamicParams is Next's
// "all paths at runtime". `revalidate` is PUBLIC_PAGE_SECONDS, as a literal Next can read.
export const dynamicParams = true;
export const revalidate = 300;
export function generateStaticParams(): { shop: string }[] {
  return [];
}

const load = cache((slug: string) => loadPublicShopPage(slug));

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { shop: slug } = await params;
  const page = await load(slug);
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

export default async function ShopPortfolioPage({ params }: Props) {
  const { shop: slug } = await params;
  const page = await load(slug);
  if (!page) notFound();
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
        <OpeningHours hours={page.openingHours} timezone={page.timezone} />
        <section aria-labelledby="booking-heading" className="relative max-w-2xl space-y-3">
          <h2 id="booking-heading" className="text-xl font-bold text-ink">
            Ask for a booking
          </h2>
          <p className="text-ink-muted">Tell the shop about your machine; they answer by e-mail or phone.</p>
          <BookingForm shop={shop.slug} />
        </section>
      </div>

      <section aria-labelledby="stories-heading" className="space-y-4">
        <h2 id="stories-heading" className="text-2xl font-bold text-ink">
          Finished jobs
        </h2>
        {page.stories.length ? (
          <StoryGrid
            shop={shop.slug}
            // Chips only for kinds among the stories on the page (the newest 200): each shows at least one.
            kinds={page.kinds.filter((k) => page.stories.some((s) => s.machine.kind === k)).map((k) => ({ kind: k, label: MACHINE_KIND_LABEL[k] }))}
            items={page.stories.map((s) => ({ key: s.slug, kind: s.machine.kind, card: <StoryCard shop={shop.slug} shopName={shop.name} story={s} /> }))}
          />
        ) : (
          <EmptyState icon={Wrench} title="No finished jobs to show yet" description="Stories appear here once an owner agrees to share how their job went." />
        )}
      </section>
    </main>
  );
}

function StoryCard({ shop, shopName, story }: { shop: string; shopName: string; story: PublicStoryCard }) {
  return (
    <article className="flex h-full flex-col overflow-hidden rounded-xl border border-line bg-surface shadow-sm">
      {story.cover ? (
        // One card a row on a phone, two from 640 px, three from 1024 px in a 1024 px column.
        <PhotoImg photo={story.cover} alt="" sizes="(min-width: 1024px) 320px, (min-width: 640px) 50vw, calc(100vw - 2rem)" className="aspect-[4/3] w-full bg-sunken object-cover" />
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
