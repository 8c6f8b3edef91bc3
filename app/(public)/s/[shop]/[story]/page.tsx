import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { ArrowLeft } from "lucide-react";
import { StoryView } from "@/components/portfolio/story-view";
import { ShopContactList } from "@/components/portfolio/shop-contact";
import { type PublicShop, storyPath } from "@/lib/portfolio";
import { loadPublicStoryPage } from "@/lib/server/portfolio-cache";

// One story, readable on a phone. Static: rendered on the first visit, then served from the
// cache until a change drops the shop's public pages (lib/server/portfolio-cache.ts). The moment
// an owner withdraws consent the consent action drops them, and this address answers 404.

type Props = { params: Promise<{ shop: string; story: string }> };

// ISR for every address, none at build time (no database there): [] with dynamicParams is
// Next's "all paths at runtime". `revalidate` is PUBLIC_PAGE_SECONDS, as a literal Next can read.
export const dynamicParams = true;
export const revalidate = 300;
export function generateStaticParams(): { shop: string; story: string }[] {
  return [];
}

const load = cache((shop: string, story: string) => loadPublicStoryPage(shop, story));

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { shop, story: slug } = await params;
  const story = await load(shop, slug);
  if (!story) return { title: "Not found", robots: { index: false } };
  const description = (story.excerpt || `${story.machine.label}: a finished job at ${story.shop.name}, with photos and notes from the bench.`).slice(0, 200);
  const url = storyPath(story.shop.slug, story.slug);
  return {
    title: { absolute: `${story.title} · ${story.shop.name}` },
    description,
    alternates: { canonical: url },
    openGraph: { type: "article", title: story.title, description, url, siteName: story.shop.name, publishedTime: story.publishedAt },
    twitter: { card: "summary_large_image", title: story.title, description },
  };
}

export default async function StoryPage({ params }: Props) {
  const { shop, story: slug } = await params;
  const story = await load(shop, slug);
  if (!story) notFound();
  return (
    <main id="main" tabIndex={-1} className="mx-auto max-w-3xl space-y-6 px-4 py-6">
      <Link href={`/s/${story.shop.slug}`} className="-ml-2 inline-flex min-h-tap items-center gap-1.5 rounded-md px-2 font-semibold text-oil hover:bg-oil-soft">
        <ArrowLeft aria-hidden className="size-5" />
        More from {story.shop.name}
      </Link>
      <StoryView story={story} coverInline={story.coverInline} />
      <ShopContact shop={story.shop} />
    </main>
  );
}

function ShopContact({ shop }: { shop: PublicShop }) {
  if (!shop.phone && !shop.email && !shop.location) return null;
  return (
    <aside aria-label={`Reach ${shop.name}`} className="space-y-2 rounded-xl border border-line bg-surface p-4">
      <p className="font-semibold text-ink">Work like this on your machine? Reach {shop.name}:</p>
      <ShopContactList shop={shop} label={`How to reach ${shop.name}`} className="flex-col" />
    </aside>
  );
}
